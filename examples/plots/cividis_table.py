"""Writes examples/plots/cividis.rs: the 256-entry cividis colour map table.

Source of the table: Nunez, Anderton & Renslow, "Optimizing colormaps with consideration for
color vision deficiency to enable accurate interpretation of scientific data", PLOS ONE 13(7):
e0199239 (2018); the same 256 sRGB entries are shipped by matplotlib (matplotlib/_cm_listed.py,
`_cividis_data`), read here. Run: python3 examples/plots/cividis_table.py (needs matplotlib).
"""

import pathlib

from matplotlib import _cm_listed

rows = _cm_listed._cividis_data
assert len(rows) == 256
out = pathlib.Path(__file__).with_name("cividis.rs")
lines = [
    "//! The cividis colour map: 256 sRGB entries, red, green, blue in [0, 1].",
    "//!",
    "//! Nuñez, Anderton & Renslow, \"Optimizing colormaps with consideration for color vision",
    "//! deficiency to enable accurate interpretation of scientific data\", PLOS ONE 13(7): e0199239",
    "//! (2018): perceptually uniform and readable with red-green colour-vision deficiency. The",
    "//! entries are the published table as matplotlib ships it (`_cividis_data`), written out by",
    "//! `cividis_table.py` beside this file.",
    "",
    "/// The table, from the low end (dark blue) to the high end (yellow).",
    "pub const CIVIDIS: [[f64; 3]; 256] = [",
]
for r, g, b in rows:
    lines.append(f"    [{r!r}, {g!r}, {b!r}],")
lines.append("];")
out.write_text("\n".join(lines) + "\n")
print(f"wrote {out}")
