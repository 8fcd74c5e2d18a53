//! The demo's pictures, as SVG text: the curvatures and the checks along the milling pass, the
//! cavity in 3D shaded by a curvature, the cavity's parameter plane with the pass, and the
//! fibre course on the wing skin.
//!
//! Shared by `examples/mould_cavity.rs` (which draws the demo's numbers) and
//! `tests/pictures.rs` (which draws small made-up data and reads the SVG back), each including
//! this folder with `#[path]`. Drawing uses plotters' SVG backend only: no system library.
//!
//! Colours: surfaces are shaded with the cividis colour map ([`cividis`]), perceptually
//! uniform and readable with colour-vision deficiency; lines and marks use the colour-blind-safe
//! qualitative palette of Okabe & Ito, "Color Universal Design" (2008) [`OKABE_ITO`], and each
//! series also differs in line style or width, so nothing depends on telling hues apart.
//!
//! What the pictures do not do: the 3D views are orthographic projections drawn here, with the
//! surface's cells painted back to front (each cell in the colour of its corners' mean value);
//! the paths, marks and tool axes are drawn over the surface without hiding the parts a wall
//! would hide. The colour bar spans the bulk of the values (2nd to 98th percentile, or
//! centred on 1/r for k1) and says how many grid points lie beyond it in its end colours.

#![allow(dead_code)]

pub mod cividis;
pub mod raw;

use plotters::coord::Shift;
use plotters::prelude::*;
use raw::{Demo, Grid, GridPoint, Sample, Stretch};
use std::path::{Path, PathBuf};

/// Okabe & Ito's palette (sRGB): black, orange, sky blue, bluish green, yellow, blue,
/// vermillion, reddish purple.
pub const OKABE_ITO: [RGBColor; 8] = [
    RGBColor(0, 0, 0),
    RGBColor(230, 159, 0),
    RGBColor(86, 180, 233),
    RGBColor(0, 158, 115),
    RGBColor(240, 228, 66),
    RGBColor(0, 114, 178),
    RGBColor(213, 94, 0),
    RGBColor(204, 121, 167),
];

/// The fill of a shaded violation interval (vermillion, see-through).
pub const VIOLATION_FILL: RGBColor = OKABE_ITO[6];
/// Its opacity.
pub const VIOLATION_OPACITY: f64 = 0.2;
/// The fill of an interval where the programmed feed exceeds the tool-centre path's limit
/// (sky blue, see-through, with dashed ends in [`CENTRE_VIOLATION_EDGE`]).
pub const CENTRE_VIOLATION_FILL: RGBColor = OKABE_ITO[2];
/// Its opacity.
pub const CENTRE_VIOLATION_OPACITY: f64 = 0.3;
/// The colour of its dashed ends (blue).
pub const CENTRE_VIOLATION_EDGE: RGBColor = OKABE_ITO[5];
/// The colour of a limit line (dashed).
pub const LIMIT_COLOUR: RGBColor = RGBColor(90, 90, 90);
/// The colour of a path drawn on a surface.
pub const PATH_COLOUR: RGBColor = RGBColor(255, 255, 255);
/// The colour of the stretches of a path that fail a check, drawn on a surface.
pub const FAIL_COLOUR: RGBColor = OKABE_ITO[6];
/// The colour of a second kind of failure on a surface (the fibre course's twist).
pub const FAIL_COLOUR_2: RGBColor = OKABE_ITO[7];
/// The colour of the fibre course.
pub const COURSE_COLOUR: RGBColor = RGBColor(0, 0, 0);
/// The colour of tool axes.
pub const AXIS_COLOUR: RGBColor = OKABE_ITO[1];

const FONT: &str = "sans-serif";
const TITLE_PX: u32 = 32;
const LABEL_PX: u32 = 25;
const TICK_PX: u32 = 22;
const WIDTH: u32 = 1100;

/// The curvature a surface is shaded by (chosen by the user).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Shade {
    /// k1: the largest curvature concave toward the tool (N points to the tool; curvature > 0
    /// bends toward N). A ball of radius r gouges where k1 > 1/r.
    Concave,
    /// k2: the smallest principal curvature (most convex toward the tool).
    Convex,
    /// The mean curvature H = (k1 + k2)/2.
    Mean,
    /// The Gaussian curvature K = k1 k2.
    Gaussian,
}

impl Shade {
    /// Every choice, with the word that selects it.
    pub const ALL: [(&'static str, Shade); 4] = [
        ("k1", Shade::Concave),
        ("k2", Shade::Convex),
        ("mean", Shade::Mean),
        ("gaussian", Shade::Gaussian),
    ];

    /// The choice a word names (`k1`, `k2`, `mean`, `gaussian`).
    pub fn from_word(word: &str) -> Result<Shade, String> {
        Shade::ALL
            .iter()
            .find(|(w, _)| *w == word)
            .map(|(_, s)| *s)
            .ok_or_else(|| {
                format!("unknown shading `{word}`: choose one of k1, k2, mean, gaussian")
            })
    }

    /// The quantity at a grid point.
    pub fn value(self, g: &GridPoint) -> f64 {
        match self {
            Shade::Concave => g.k1,
            Shade::Convex => g.k2,
            Shade::Mean => g.h,
            Shade::Gaussian => g.k,
        }
    }

    /// What the colour bar says: the quantity and its unit.
    pub fn label(self) -> &'static str {
        match self {
            Shade::Concave => "k1, largest concave curvature (1/mm)",
            Shade::Convex => "k2, smallest principal curvature (1/mm)",
            Shade::Mean => "mean curvature H (1/mm)",
            Shade::Gaussian => "Gaussian curvature K (1/mm²)",
        }
    }

    /// A few words for a title.
    pub fn short(self) -> &'static str {
        match self {
            Shade::Concave => "the largest curvature concave toward the tool, k1",
            Shade::Convex => "the smallest principal curvature, k2",
            Shade::Mean => "the mean curvature H",
            Shade::Gaussian => "the Gaussian curvature K",
        }
    }
}

/// The cividis colour at `x` in [0, 1] (clamped), interpolated linearly between the table's
/// entries.
pub fn colour(x: f64) -> RGBColor {
    let x = if x.is_finite() {
        x.clamp(0.0, 1.0)
    } else {
        0.0
    };
    let table = &cividis::CIVIDIS;
    let f = x * (table.len() - 1) as f64;
    let i = (f.floor() as usize).min(table.len() - 2);
    let w = f - i as f64;
    let c = |k: usize| {
        let v = table[i][k] * (1.0 - w) + table[i + 1][k] * w;
        (v * 255.0).round() as u8
    };
    RGBColor(c(0), c(1), c(2))
}

/// A picture: its file name and its SVG text.
#[derive(Debug, Clone)]
pub struct Picture {
    /// File name (`*.svg`).
    pub name: &'static str,
    /// The SVG document.
    pub svg: String,
}

fn err<E: std::fmt::Display>(e: E) -> String {
    format!("drawing failed: {e}")
}

type Area<'a> = DrawingArea<SVGBackend<'a>, Shift>;

/// Every picture of the demo.
pub fn all(demo: &Demo, shade: Shade) -> Result<Vec<Picture>, String> {
    Ok(vec![
        Picture {
            name: "pass_curvatures.svg",
            svg: pass_curvatures(&demo.pass)?,
        },
        Picture {
            name: "pass_checks.svg",
            svg: pass_checks(&demo.pass)?,
        },
        Picture {
            name: "cavity_3d.svg",
            svg: cavity_3d(&demo.cavity, &demo.pass, shade)?,
        },
        Picture {
            name: "cavity_uv.svg",
            svg: cavity_uv(&demo.cavity, &demo.pass, shade)?,
        },
        Picture {
            name: "wing_course.svg",
            svg: wing_course(&demo.wing, &demo.course)?,
        },
        Picture {
            name: "wing_gaps.svg",
            svg: wing_gaps(&demo.wing, &demo.courses)?,
        },
    ])
}

/// Writes the pictures into `dir` (created if needed) and returns their paths.
pub fn write_all(dir: &Path, pictures: &[Picture]) -> Result<Vec<PathBuf>, String> {
    std::fs::create_dir_all(dir).map_err(|e| format!("cannot create {}: {e}", dir.display()))?;
    pictures
        .iter()
        .map(|p| {
            let path = dir.join(p.name);
            std::fs::write(&path, &p.svg)
                .map_err(|e| format!("cannot write {}: {e}", path.display()))?;
            Ok(path)
        })
        .collect()
}

/// The smallest and largest finite values, widened a little (and to a non-empty range).
fn range(values: impl IntoIterator<Item = f64>) -> (f64, f64) {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for v in values.into_iter().filter(|v| v.is_finite()) {
        lo = lo.min(v);
        hi = hi.max(v);
    }
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    let pad = if hi > lo {
        0.06 * (hi - lo)
    } else {
        0.5 * lo.abs().max(1e-6)
    };
    (lo - pad, hi + pad)
}

/// A line of a panel: its label, its (arc length, value) points, its colour, and whether it
/// is dashed.
type Series<'a> = (&'a str, Vec<(f64, f64)>, RGBColor, bool);

/// Intervals of a panel shaded in one style: full-height see-through rectangles of `fill`,
/// with dashed vertical lines of `edge` at their ends when set (so two kinds of interval
/// differ in more than hue).
pub struct Shading<'a> {
    /// The intervals.
    pub stretches: Vec<Stretch>,
    /// The fill colour.
    pub fill: RGBColor,
    /// Its opacity.
    pub opacity: f64,
    /// The colour of the dashed ends, if drawn.
    pub edge: Option<RGBColor>,
    /// What a shaded interval means (the legend's label).
    pub label: &'a str,
}

impl<'a> Shading<'a> {
    /// The usual violation shading (vermillion, no edges) of `stretches`.
    fn violations(stretches: Vec<&Stretch>, label: &'a str) -> Shading<'a> {
        Shading {
            stretches: stretches.into_iter().cloned().collect(),
            fill: VIOLATION_FILL,
            opacity: VIOLATION_OPACITY,
            edge: None,
            label,
        }
    }
}

/// One panel of values against arc length: the series (label, values, colour, dashed?), the
/// intervals to shade, and limit lines (label, value). The legend goes into an empty corner
/// of the plotting area chosen from the data, or above the data when no corner is empty.
struct Panel<'a> {
    y_label: &'a str,
    series: Vec<Series<'a>>,
    shaded: Vec<Shading<'a>>,
    limits: Vec<(String, f64)>,
    y_range: Option<(f64, f64)>,
    /// Arc lengths where the path crosses a knot line of the surface (drawn as thin dotted
    /// vertical lines: derivatives of the surface may jump there).
    knots: Vec<f64>,
}

/// How a legend entry shows its series: the same colour, width and dashing as the series.
#[derive(Debug, Clone, Copy)]
pub enum Swatch {
    /// A line (dashed or solid) of a colour and width.
    Line {
        /// Colour.
        colour: RGBColor,
        /// Width (px).
        width: u32,
        /// Dashed as the series is.
        dashed: bool,
    },
    /// A shaded interval: a see-through box, with dashed sides when the shading has edges.
    Fill {
        /// Colour.
        colour: RGBColor,
        /// Opacity.
        opacity: f64,
        /// The colour of the dashed ends, if any.
        edge: Option<RGBColor>,
    },
    /// A line drawn over a wider line of another colour (a path on a surface).
    Cased {
        /// The inner line's colour.
        inner: RGBColor,
        /// Its width (px).
        inner_width: u32,
        /// The casing's colour.
        outer: RGBColor,
        /// Its width (px).
        outer_width: u32,
    },
    /// A thin dotted vertical mark (knot crossings).
    Mark {
        /// Colour.
        colour: RGBColor,
    },
}

/// One entry of a legend.
pub type LegendItem = (String, Swatch);

const LEGEND_ROW: i32 = 30;
const LEGEND_SWATCH: i32 = 40;

/// A legend's size in pixels (the text width estimated from the characters: SVG text has no
/// metrics until a viewer renders it; 0.56 em per character is generous for sans-serif).
fn legend_size(items: &[LegendItem]) -> (i32, i32) {
    let chars = items.iter().map(|i| i.0.chars().count()).max().unwrap_or(0);
    let text = (chars as f64 * 0.56 * TICK_PX as f64).ceil() as i32;
    (
        12 + LEGEND_SWATCH + 10 + text + 12,
        10 + LEGEND_ROW * items.len() as i32 + 6,
    )
}

/// Dashes from `a` to `b` (pixels), `on` drawn and `off` skipped.
fn dashes(a: (i32, i32), b: (i32, i32), on: f64, off: f64) -> Vec<[(i32, i32); 2]> {
    let (dx, dy) = ((b.0 - a.0) as f64, (b.1 - a.1) as f64);
    let len = dx.hypot(dy);
    let mut out = Vec::new();
    let mut t = 0.0;
    while t < len {
        let e = (t + on).min(len);
        let at = |d: f64| {
            (
                a.0 + (dx * d / len).round() as i32,
                a.1 + (dy * d / len).round() as i32,
            )
        };
        out.push([at(t), at(e)]);
        t = e + off;
    }
    out
}

/// Draws a legend with its top-left corner at `(x, y)` (pixels of `area`): a white box, and
/// one row per item, its swatch drawn like its series.
fn draw_legend<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    (x, y): (i32, i32),
    items: &[LegendItem],
) -> Result<(), String> {
    if items.is_empty() {
        return Ok(());
    }
    let e = |e: DrawingAreaErrorKind<DB::ErrorType>| format!("drawing failed: {e:?}");
    let (w, h) = legend_size(items);
    area.draw(&Rectangle::new(
        [(x, y), (x + w, y + h)],
        WHITE.mix(0.92).filled(),
    ))
    .map_err(e)?;
    area.draw(&Rectangle::new(
        [(x, y), (x + w, y + h)],
        RGBColor(150, 150, 150).stroke_width(1),
    ))
    .map_err(e)?;
    for (k, (label, swatch)) in items.iter().enumerate() {
        let cy = y + 10 + LEGEND_ROW * k as i32 + LEGEND_ROW / 2;
        let (x0, x1) = (x + 12, x + 12 + LEGEND_SWATCH);
        match *swatch {
            Swatch::Line {
                colour,
                width,
                dashed,
            } => {
                let style = colour.stroke_width(width);
                if dashed {
                    for d in dashes((x0, cy), (x1, cy), 8.0, 5.0) {
                        area.draw(&PathElement::new(d.to_vec(), style)).map_err(e)?;
                    }
                } else {
                    area.draw(&PathElement::new(vec![(x0, cy), (x1, cy)], style))
                        .map_err(e)?;
                }
            }
            Swatch::Fill {
                colour,
                opacity,
                edge,
            } => {
                area.draw(&Rectangle::new(
                    [(x0, cy - 9), (x1, cy + 9)],
                    colour.mix(opacity).filled(),
                ))
                .map_err(e)?;
                if let Some(c) = edge {
                    for xe in [x0, x1] {
                        for d in dashes((xe, cy - 9), (xe, cy + 9), 4.0, 3.0) {
                            area.draw(&PathElement::new(d.to_vec(), c.stroke_width(2)))
                                .map_err(e)?;
                        }
                    }
                }
            }
            Swatch::Cased {
                inner,
                inner_width,
                outer,
                outer_width,
            } => {
                for (c, w) in [(outer, outer_width), (inner, inner_width)] {
                    area.draw(&PathElement::new(
                        vec![(x0, cy), (x1, cy)],
                        c.stroke_width(w),
                    ))
                    .map_err(e)?;
                }
            }
            Swatch::Mark { colour } => {
                let xm = (x0 + x1) / 2;
                for d in dashes((xm, cy - 11), (xm, cy + 11), 3.0, 4.0) {
                    area.draw(&PathElement::new(d.to_vec(), colour.stroke_width(1)))
                        .map_err(e)?;
                }
            }
        }
        area.draw(&Text::new(
            label.clone(),
            (x1 + 10, cy),
            TextStyle::from((FONT, TICK_PX).into_font()).pos(
                plotters::style::text_anchor::Pos::new(
                    plotters::style::text_anchor::HPos::Left,
                    plotters::style::text_anchor::VPos::Center,
                ),
            ),
        ))
        .map_err(e)?;
    }
    Ok(())
}

/// The corner of a `w` x `h` pixel plotting area for a `box_w` x `box_h` legend that covers
/// the fewest of the drawn points `busy` (pixels; the first corner of upper right, upper left,
/// lower right, lower left with the fewest), and how many it covers.
fn emptiest_corner(
    (w, h): (i32, i32),
    (box_w, box_h): (i32, i32),
    busy: &[(f64, f64)],
) -> ((i32, i32), usize) {
    emptiest_corner_of(w, h, (box_w, box_h), busy, &[])
}

/// The same, breaking ties between corners by the fewest `soft` points covered (shaded
/// intervals: better not hidden, but less than a line).
fn emptiest_corner_of(
    w: i32,
    h: i32,
    (box_w, box_h): (i32, i32),
    busy: &[(f64, f64)],
    soft: &[(f64, f64)],
) -> ((i32, i32), usize) {
    let inset = 8;
    let corners = [
        (w - inset - box_w, inset),
        (inset, inset),
        (w - inset - box_w, h - inset - box_h),
        (inset, h - inset - box_h),
    ];
    let covered = |(x, y): (i32, i32), busy: &[(f64, f64)]| {
        let pad = 6.0;
        busy.iter()
            .filter(|p| {
                p.0 >= (x as f64 - pad)
                    && p.0 <= (x + box_w) as f64 + pad
                    && p.1 >= y as f64 - pad
                    && p.1 <= (y + box_h) as f64 + pad
            })
            .count()
    };
    corners
        .iter()
        .map(|&c| (c, covered(c, busy), covered(c, soft)))
        .min_by_key(|c| (c.1, c.2))
        .map(|c| (c.0, c.1))
        .expect("four corners")
}

type Chart2d<'a, DB> = ChartContext<
    'a,
    DB,
    Cartesian2d<plotters::coord::types::RangedCoordf64, plotters::coord::types::RangedCoordf64>,
>;

/// Draws a legend in the corner of a chart's plotting area that covers the fewest of the
/// `busy` points (chart coordinates).
fn legend_in_corner<DB: DrawingBackend>(
    chart: &Chart2d<'_, DB>,
    items: &[LegendItem],
    busy: &[(f64, f64)],
) -> Result<(), String> {
    let plotting = chart.plotting_area().strip_coord_spec();
    let (bx, by) = chart.plotting_area().get_base_pixel();
    let px: Vec<(f64, f64)> = busy
        .iter()
        .map(|p| {
            let q = chart.as_coord_spec().translate(p);
            ((q.0 - bx) as f64, (q.1 - by) as f64)
        })
        .collect();
    let (w, h) = plotting.dim_in_pixel();
    let (corner, _) = emptiest_corner((w as i32, h as i32), legend_size(items), &px);
    draw_legend(&plotting, corner, items)
}

/// Screen points covering a grid seen from `view`: each cell's projected quadrilateral
/// sampled at 5 x 5 bilinear points.
fn surface_points(grid: &Grid, view: &View) -> Vec<(f64, f64)> {
    let mut out = Vec::new();
    for i in 0..grid.nu - 1 {
        for j in 0..grid.nv - 1 {
            let c = [
                view.project(grid.at(i, j).p),
                view.project(grid.at(i + 1, j).p),
                view.project(grid.at(i + 1, j + 1).p),
                view.project(grid.at(i, j + 1).p),
            ];
            for a in 0..5 {
                for b in 0..5 {
                    let (f, g) = (a as f64 / 4.0, b as f64 / 4.0);
                    let w = [(1.0 - f) * (1.0 - g), f * (1.0 - g), f * g, (1.0 - f) * g];
                    out.push((
                        (0..4).map(|k| w[k] * c[k].0).sum(),
                        (0..4).map(|k| w[k] * c[k].1).sum(),
                    ));
                }
            }
        }
    }
    out
}

/// Points every few pixels along a polyline given in pixels (so a legend box that a line
/// crosses between its samples counts as covering it).
fn densify(line: &[(f64, f64)], step: f64) -> Vec<(f64, f64)> {
    let mut out = Vec::new();
    for w in line.windows(2) {
        let (a, b) = (w[0], w[1]);
        let n = ((b.0 - a.0).hypot(b.1 - a.1) / step).ceil().max(1.0) as usize;
        for k in 0..n {
            let f = k as f64 / n as f64;
            out.push((a.0 + f * (b.0 - a.0), a.1 + f * (b.1 - a.1)));
        }
    }
    out.extend(line.last().copied());
    out
}

/// The colour of the knot-crossing marks.
pub const KNOT_COLOUR: RGBColor = RGBColor(140, 140, 140);

/// The arc lengths where a sampled path crosses the interior knot lines u = k or v = k, by
/// linear interpolation between the samples on either side.
pub fn knot_crossings(samples: &[Sample], knots_u: &[f64], knots_v: &[f64]) -> Vec<f64> {
    let interior = |k: &[f64]| -> Vec<f64> {
        let (a, b) = (k.first().copied(), k.last().copied());
        let mut v: Vec<f64> = k
            .iter()
            .copied()
            .filter(|x| Some(*x) != a && Some(*x) != b)
            .collect();
        v.dedup();
        v
    };
    let mut out = Vec::new();
    for (knots, pick) in [
        (interior(knots_u), (|x: &Sample| x.u) as fn(&Sample) -> f64),
        (interior(knots_v), |x: &Sample| x.v),
    ] {
        for w in samples.windows(2) {
            let (a, b) = (pick(&w[0]), pick(&w[1]));
            for &k in &knots {
                if (a < k && k <= b) || (b < k && k <= a) {
                    out.push(w[0].s + (k - a) / (b - a) * (w[1].s - w[0].s));
                }
            }
        }
    }
    out.sort_by(f64::total_cmp);
    out
}

/// Tick labels with as many decimals as the tick spacing of `span` needs.
fn tick_format(span: f64) -> impl Fn(&f64) -> String {
    let step = span / 6.0;
    let decimals = if step > 0.0 && step.is_finite() {
        (-step.log10().floor()).clamp(0.0, 8.0) as usize
    } else {
        2
    };
    move |v: &f64| {
        let t = format!("{v:.decimals$}");
        if t.starts_with('-') && t.trim_start_matches(['-', '0', '.']).is_empty() {
            t[1..].to_string()
        } else {
            t
        }
    }
}

fn draw_panel(
    area: &Area<'_>,
    caption: &str,
    length: f64,
    panel: &Panel<'_>,
) -> Result<(), String> {
    let (lo, hi) = panel.y_range.unwrap_or_else(|| {
        range(
            panel
                .series
                .iter()
                .flat_map(|(_, v, _, _)| v.iter().map(|p| p.1))
                .chain(panel.limits.iter().map(|l| l.1)),
        )
    });
    let mut items: Vec<LegendItem> = Vec::new();
    if !panel.knots.is_empty() {
        items.push((
            "crosses a knot line".to_string(),
            Swatch::Mark {
                colour: KNOT_COLOUR,
            },
        ));
    }
    for sh in panel.shaded.iter().filter(|s| !s.stretches.is_empty()) {
        items.push((
            sh.label.to_string(),
            Swatch::Fill {
                colour: sh.fill,
                opacity: sh.opacity,
                edge: sh.edge,
            },
        ));
    }
    for (label, _) in &panel.limits {
        items.push((
            label.clone(),
            Swatch::Line {
                colour: LIMIT_COLOUR,
                width: 2,
                dashed: true,
            },
        ));
    }
    for (label, _, c, dashed) in &panel.series {
        items.push((
            label.to_string(),
            Swatch::Line {
                colour: *c,
                width: 3,
                dashed: *dashed,
            },
        ));
    }
    let area = area.titled(caption, (FONT, LABEL_PX + 2)).map_err(err)?;
    let (margin, margin_right, x_area, y_area) = (12, 28, 56, 96);
    let (aw, ah) = area.dim_in_pixel();
    let plot = (
        aw as i32 - margin - margin_right - y_area,
        ah as i32 - 2 * margin - x_area,
    );
    // The drawn lines in pixels of the plotting area, for a y range.
    let busy = |(w, h): (i32, i32), hi: f64| -> Vec<(f64, f64)> {
        let px = |p: &(f64, f64)| (p.0 / length * w as f64, (hi - p.1) / (hi - lo) * h as f64);
        let mut out = Vec::new();
        for (_, v, _, _) in &panel.series {
            let line: Vec<(f64, f64)> = v.iter().filter(|p| p.1.is_finite()).map(px).collect();
            out.extend(densify(&line, 4.0));
        }
        for (_, value) in &panel.limits {
            out.extend(densify(&[px(&(0.0, *value)), px(&(length, *value))], 4.0));
        }
        out
    };
    let size = legend_size(&items);
    // No empty corner: room above the data for the legend, which then hides nothing.
    let hi = if emptiest_corner(plot, size, &busy(plot, hi)).1 == 0 {
        hi
    } else {
        let room = (size.1 + 16) as f64;
        hi + room * (hi - lo) / (plot.1 as f64 - room).max(1.0)
    };
    let mut chart = ChartBuilder::on(&area)
        .margin(margin as u32)
        .margin_right(margin_right as u32)
        .x_label_area_size(x_area as u32)
        .y_label_area_size(y_area as u32)
        .build_cartesian_2d(0.0..length, lo..hi)
        .map_err(err)?;
    chart
        .configure_mesh()
        .x_desc("arc length along the path s (mm)")
        .y_desc(panel.y_label)
        .axis_desc_style((FONT, LABEL_PX))
        .label_style((FONT, TICK_PX))
        .bold_line_style(RGBColor(225, 225, 225))
        .light_line_style(TRANSPARENT)
        .x_labels(10)
        .y_labels(6)
        .x_label_formatter(&tick_format(length))
        .y_label_formatter(&tick_format(hi - lo))
        .draw()
        .map_err(err)?;
    for &s in &panel.knots {
        chart
            .draw_series(DashedLineSeries::new(
                [(s, lo), (s, hi)],
                3,
                4,
                KNOT_COLOUR.stroke_width(1),
            ))
            .map_err(err)?;
    }
    for sh in &panel.shaded {
        let fill = sh.fill.mix(sh.opacity).filled();
        for st in &sh.stretches {
            chart
                .draw_series(std::iter::once(Rectangle::new(
                    [(st.start, lo), (st.end, hi)],
                    fill,
                )))
                .map_err(err)?;
            if let Some(c) = sh.edge {
                for x in [st.start, st.end] {
                    chart
                        .draw_series(DashedLineSeries::new(
                            [(x, lo), (x, hi)],
                            6,
                            4,
                            c.stroke_width(2),
                        ))
                        .map_err(err)?;
                }
            }
        }
    }
    for (_, value) in &panel.limits {
        chart
            .draw_series(DashedLineSeries::new(
                [(0.0, *value), (length, *value)],
                10,
                6,
                LIMIT_COLOUR.stroke_width(2),
            ))
            .map_err(err)?;
    }
    for (_, values, c, dashed) in &panel.series {
        let style = c.stroke_width(3);
        if *dashed {
            chart
                .draw_series(DashedLineSeries::new(values.iter().copied(), 8, 5, style))
                .map_err(err)?;
        } else {
            chart
                .draw_series(LineSeries::new(values.iter().copied(), style))
                .map_err(err)?;
        }
    }
    let plotting = chart.plotting_area().strip_coord_spec();
    let (pw, ph) = plotting.dim_in_pixel();
    let dims = (pw as i32, ph as i32);
    // The shaded intervals, sampled every 8 px, as points better left uncovered.
    let mut soft = Vec::new();
    for sh in &panel.shaded {
        for st in &sh.stretches {
            let (a, b) = (st.start / length * pw as f64, st.end / length * pw as f64);
            let mut x = a;
            while x <= b {
                soft.extend((0..=ph / 8).map(|k| (x, 8.0 * k as f64)));
                x += 8.0;
            }
        }
    }
    let (corner, _) = emptiest_corner_of(dims.0, dims.1, size, &busy(dims, hi), &soft);
    draw_legend(&plotting, corner, &items)?;
    Ok(())
}

fn path_length(samples: &[Sample]) -> f64 {
    samples.last().map_or(1.0, |s| s.s).max(f64::MIN_POSITIVE)
}

fn along(samples: &[Sample], f: impl Fn(&Sample) -> f64) -> Vec<(f64, f64)> {
    samples.iter().map(|s| (s.s, f(s))).collect()
}

/// κn, κg and τg along the pass.
pub fn pass_curvatures(pass: &raw::MillPass) -> Result<String, String> {
    let samples = &pass.samples;
    let knots = knot_crossings(samples, &pass.knots_u, &pass.knots_v);
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (WIDTH, 560)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let area = root
            .titled(
                "The Darboux frame's curvatures along the finishing pass",
                (FONT, TITLE_PX),
            )
            .map_err(err)?;
        let panel = Panel {
            y_label: "curvature (1/mm), torsion (rad/mm)",
            series: vec![
                (
                    "normal curvature κn",
                    along(samples, |s| s.kn),
                    OKABE_ITO[5],
                    false,
                ),
                (
                    "geodesic curvature κg",
                    along(samples, |s| s.kg),
                    OKABE_ITO[1],
                    true,
                ),
                (
                    "geodesic torsion τg",
                    along(samples, |s| s.tg),
                    OKABE_ITO[3],
                    false,
                ),
            ],
            shaded: vec![],
            limits: vec![],
            y_range: None,
            knots: knots.clone(),
        };
        draw_panel(
            &area,
            "κn: bending with the surface · κg: bending sideways in it · τg: N turning about the pass",
            path_length(samples),
            &panel,
        )?;
        root.present().map_err(err)?;
    }
    Ok(svg)
}

/// The checks along the pass: k1, k2 against 1/r; the scallop height against its limit; the
/// feed against the programmed feed (and the tool centre's feed when the demo prints it).
/// Every violation interval is shaded in the panel of its check.
pub fn pass_checks(pass: &raw::MillPass) -> Result<String, String> {
    let samples = &pass.samples;
    let knots = knot_crossings(samples, &pass.knots_u, &pass.knots_v);
    let length = path_length(samples);
    let kinds = |k: &str| {
        pass.stretches
            .iter()
            .filter(|s| s.kind == k)
            .collect::<Vec<_>>()
    };
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (WIDTH, 1300)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let area = root
            .titled(
                "Where the finishing pass fails its checks (shaded), and why",
                (FONT, TITLE_PX),
            )
            .map_err(err)?;
        let panels = area.split_evenly((3, 1));
        let r = pass.ball_radius;
        let gouge = Panel {
            y_label: "principal curvature (1/mm)",
            series: vec![
                (
                    "k1 (largest, concave > 0)",
                    along(samples, |s| s.k1),
                    OKABE_ITO[5],
                    false,
                ),
                (
                    "k2 (smallest)",
                    along(samples, |s| s.k2),
                    OKABE_ITO[3],
                    true,
                ),
            ],
            shaded: vec![Shading::violations(kinds("gouge"), "the ball gouges")],
            limits: vec![(format!("1/r of the ball, r = {r} mm"), 1.0 / r)],
            y_range: None,
            knots: knots.clone(),
        };
        draw_panel(
            &panels[0],
            "Gouging: the ball does not fit where k1 > 1/r",
            length,
            &gouge,
        )?;
        let scallop: Vec<(f64, f64)> = samples
            .iter()
            .zip(&pass.scallop)
            .filter(|(_, h)| h.is_finite())
            .map(|(s, h)| (s.s, *h))
            .collect();
        let (lo, hi) = range(scallop.iter().map(|p| p.1).chain([0.0, pass.scallop_limit]));
        let scallop_panel = Panel {
            y_label: "scallop height (mm)",
            series: vec![("scallop height", scallop, OKABE_ITO[5], false)],
            shaded: vec![Shading::violations(
                kinds("scallop"),
                "scallop above the limit",
            )],
            limits: vec![(
                format!("limit {} mm", pass.scallop_limit),
                pass.scallop_limit,
            )],
            y_range: Some((lo.max(0.0), hi)),
            knots: knots.clone(),
        };
        draw_panel(
            &panels[1],
            "Scallop left between passes (none drawn where the ball gouges)",
            length,
            &scallop_panel,
        )?;
        let per_min = |v: &[f64]| -> Vec<(f64, f64)> {
            samples
                .iter()
                .zip(v)
                .map(|(s, f)| (s.s, 60.0 * f))
                .collect()
        };
        let mut series = vec![(
            "feed limit on the contact path",
            per_min(&pass.feed),
            OKABE_ITO[5],
            false,
        )];
        let mut shaded = vec![Shading::violations(
            kinds("feed"),
            "programmed feed above the contact-path limit",
        )];
        if let Some(centre) = &pass.centre_feed {
            series.push((
                "feed limit on the tool-centre path",
                per_min(centre),
                OKABE_ITO[1],
                true,
            ));
            shaded.push(Shading {
                stretches: centre_feed_violations(pass)?,
                fill: CENTRE_VIOLATION_FILL,
                opacity: CENTRE_VIOLATION_OPACITY,
                edge: Some(CENTRE_VIOLATION_EDGE),
                label: "programmed feed above the tool-centre-path limit (grey: above both)",
            });
        }
        let feed = Panel {
            y_label: "feed (mm/min)",
            series,
            shaded,
            limits: vec![(
                format!("programmed feed {:.0} mm/min", 60.0 * pass.programmed_feed),
                60.0 * pass.programmed_feed,
            )],
            y_range: None,
            knots: knots.clone(),
        };
        draw_panel(
            &panels[2],
            "Feed: acceleration and jerk limits slow the tool where the pass bends",
            length,
            &feed,
        )?;
        root.present().map_err(err)?;
    }
    Ok(svg)
}

/// A sample seen by strake's interval finder: its arc length (the raw samples carry no curve
/// parameter here, so t is the arc length too).
struct AtArcLength(f64);

impl strake::checks::PathPosition for AtArcLength {
    fn t(&self) -> f64 {
        self.0
    }
    fn arc_length(&self) -> f64 {
        self.0
    }
}

/// Where the programmed feed exceeds the feed limit on the tool-centre path (empty without
/// those raw lines): the maximal runs of samples with `programmed - centre > 0`, their ends
/// interpolated linearly between samples, by strake's own rule for violation intervals
/// (`strake::checks::violations`, the rule the demo's other intervals come from).
pub fn centre_feed_violations(pass: &raw::MillPass) -> Result<Vec<Stretch>, String> {
    let Some(centre) = &pass.centre_feed else {
        return Ok(Vec::new());
    };
    let at: Vec<AtArcLength> = pass.samples.iter().map(|s| AtArcLength(s.s)).collect();
    let excess: Vec<f64> = centre.iter().map(|c| pass.programmed_feed - c).collect();
    let mut found = Vec::new();
    strake::checks::violations(&at, &excess, 0.0, &mut found)
        .map_err(|e| format!("centre feed intervals: {e}"))?;
    Ok(found
        .iter()
        .map(|v| Stretch {
            kind: "centre_feed".to_string(),
            start: v.start_arc_length,
            end: v.end_arc_length,
        })
        .collect())
}

/// An orthographic view from azimuth `azimuth` and elevation `elevation` (radians), heights
/// multiplied by `z_scale`: screen (x, y up) and depth (larger = farther).
#[derive(Debug, Clone, Copy)]
pub struct View {
    /// Turn about the vertical (radians).
    pub azimuth: f64,
    /// Angle of the line of sight below the horizontal (radians).
    pub elevation: f64,
    /// Vertical exaggeration.
    pub z_scale: f64,
}

impl View {
    /// Screen x, screen y (up) and depth of a point.
    pub fn project(&self, p: [f64; 3]) -> (f64, f64, f64) {
        let (sa, ca) = self.azimuth.sin_cos();
        let (se, ce) = self.elevation.sin_cos();
        let right = p[0] * ca + p[1] * sa;
        let ahead = -p[0] * sa + p[1] * ca;
        let z = p[2] * self.z_scale;
        (right, ahead * se + z * ce, ahead * ce - z * se)
    }
}

/// The range the colour bar spans: from the 2nd to the 98th percentile of the values (so a few
/// extreme corners do not wash out the rest), widened to include 0; with a `mark` (a limit),
/// from the lower end to as far above the mark, so the mark sits in the middle. Values beyond
/// the range take the end colours (the colour bar says so).
pub fn colour_range(values: &[f64], mark: Option<f64>) -> (f64, f64) {
    let mut v: Vec<f64> = values.iter().copied().filter(|x| x.is_finite()).collect();
    if v.is_empty() {
        return (0.0, 1.0);
    }
    v.sort_by(f64::total_cmp);
    let at = |q: f64| v[((v.len() - 1) as f64 * q).round() as usize];
    let (mut lo, mut hi) = (at(0.02), at(0.98));
    if let Some(m) = mark {
        // The mark in the middle of the bar: the colours tell below from above it.
        lo = lo.min(0.0);
        hi = 2.0 * m - lo;
    }
    lo = lo.min(0.0);
    if hi <= lo {
        hi = lo + 1e-6;
    }
    (lo, hi)
}

/// A vertical colour bar for `lo..hi` with its label, and a marked value.
fn colour_bar(
    area: &Area<'_>,
    label: &str,
    (lo, hi): (f64, f64),
    values: &[f64],
    mark: Option<(String, f64)>,
) -> Result<(), String> {
    let (w, h) = area.dim_in_pixel();
    let note = |above: bool| {
        let n = values
            .iter()
            .filter(|&&v| if above { v > hi } else { v < lo })
            .count();
        (n > 0).then(|| {
            let pct = 100.0 * n as f64 / values.len() as f64;
            format!(
                "{pct:.0}% {} in end colour",
                if above { "above" } else { "below" }
            )
        })
    };
    let small = TextStyle::from((FONT, TICK_PX - 3).into_font());
    if let Some(t) = note(true) {
        area.draw(&Text::new(t, (8, 14), small.clone()))
            .map_err(err)?;
    }
    if let Some(t) = note(false) {
        area.draw(&Text::new(t, (8, h as i32 - 28), small))
            .map_err(err)?;
    }
    let _ = w;
    let mut chart = ChartBuilder::on(area)
        .margin_top(40)
        .margin_bottom(40)
        .margin_right(10)
        .y_label_area_size(90)
        .build_cartesian_2d(0.0..1.0, lo..hi)
        .map_err(err)?;
    chart
        .configure_mesh()
        .disable_x_mesh()
        .disable_y_mesh()
        .disable_x_axis()
        .y_desc(label)
        .y_labels(8)
        .axis_desc_style((FONT, LABEL_PX))
        .label_style((FONT, TICK_PX))
        .draw()
        .map_err(err)?;
    let steps = 96;
    chart
        .draw_series((0..steps).map(|k| {
            let a = lo + (hi - lo) * k as f64 / steps as f64;
            // Each step overlaps the next a little, so no seam shows between them.
            let b = lo + (hi - lo) * (k as f64 + 1.3).min(steps as f64) / steps as f64;
            Rectangle::new(
                [(0.0, a), (1.0, b)],
                colour((k as f64 + 0.5) / steps as f64).filled(),
            )
        }))
        .map_err(err)?;
    if let Some((text, m)) = mark {
        chart
            .draw_series(std::iter::once(PathElement::new(
                vec![(-0.15, m), (1.0, m)],
                FAIL_COLOUR.stroke_width(4),
            )))
            .map_err(err)?;
        chart
            .draw_series(std::iter::once(Text::new(
                text,
                (0.0, m + 0.02 * (hi - lo)),
                (FONT, TICK_PX).into_font().color(&WHITE),
            )))
            .map_err(err)?;
    }
    Ok(())
}

/// The ranges for a `w` x `h` pixel plotting area that show the `(x, y)` screen points with
/// equal scales on both axes, in the upper `1 - reserve` of the height (the rest left free
/// below them for a legend and a note).
fn equal_axes(points: &[(f64, f64)], w: f64, h: f64, reserve: f64) -> ((f64, f64), (f64, f64)) {
    let (x0, x1) = range(points.iter().map(|p| p.0));
    let (y0, y1) = range(points.iter().map(|p| p.1));
    let scale = ((x1 - x0) / w).max((y1 - y0) / (h * (1.0 - reserve)));
    let cx = 0.5 * (x0 + x1);
    (
        (cx - 0.5 * scale * w, cx + 0.5 * scale * w),
        (y1 - scale * h, y1),
    )
}

/// The stretches of a path that lie in `stretches`, as runs of samples (with the ends cut to
/// the samples inside).
fn runs<'a>(samples: &'a [Sample], stretches: &[&Stretch]) -> Vec<Vec<&'a Sample>> {
    stretches
        .iter()
        .map(|st| {
            samples
                .iter()
                .filter(|s| s.s >= st.start && s.s <= st.end)
                .collect::<Vec<_>>()
        })
        .filter(|r| !r.is_empty())
        .collect()
}

/// Draws a surface grid seen from `view` as quadrilaterals back to front, each filled by
/// `fill` of its four corners.
fn draw_surface<DB: DrawingBackend>(
    chart: &mut ChartContext<
        '_,
        DB,
        Cartesian2d<plotters::coord::types::RangedCoordf64, plotters::coord::types::RangedCoordf64>,
    >,
    grid: &Grid,
    view: &View,
    fill: impl Fn([&GridPoint; 4]) -> RGBColor,
    edge: Option<RGBColor>,
) -> Result<(), String> {
    let mut quads = Vec::new();
    for i in 0..grid.nu - 1 {
        for j in 0..grid.nv - 1 {
            let c = [
                grid.at(i, j),
                grid.at(i + 1, j),
                grid.at(i + 1, j + 1),
                grid.at(i, j + 1),
            ];
            let pr: Vec<(f64, f64, f64)> = c.iter().map(|g| view.project(g.p)).collect();
            let depth = pr.iter().map(|p| p.2).sum::<f64>() / 4.0;
            quads.push((depth, pr, fill(c)));
        }
    }
    quads.sort_by(|a, b| b.0.total_cmp(&a.0));
    for (_, pr, c) in quads {
        let pts: Vec<(f64, f64)> = pr.iter().map(|p| (p.0, p.1)).collect();
        let edge_style = edge.unwrap_or(c).stroke_width(1);
        chart
            .draw_series(std::iter::once(Polygon::new(pts.clone(), c.filled())))
            .map_err(|e| format!("drawing failed: {e:?}"))?;
        let mut closed = pts;
        closed.push(closed[0]);
        chart
            .draw_series(std::iter::once(PathElement::new(closed, edge_style)))
            .map_err(|e| format!("drawing failed: {e:?}"))?;
    }
    Ok(())
}

/// The cavity in 3D, shaded by `shade`, with the pass, its gouging stretches and the tool axis
/// at a few stations.
pub fn cavity_3d(grid: &Grid, pass: &raw::MillPass, shade: Shade) -> Result<String, String> {
    let view = View {
        azimuth: -0.42,
        elevation: 0.95,
        z_scale: 2.0,
    };
    let values: Vec<f64> = grid.points.iter().map(|g| shade.value(g)).collect();
    let limit = (shade == Shade::Concave).then(|| 1.0 / pass.ball_radius);
    let (lo, hi) = colour_range(&values, limit);
    let axis_length = 2.5 * pass.ball_radius;
    let stations: Vec<&Sample> = {
        let n = pass.samples.len();
        (0..6).map(|k| &pass.samples[(k * (n - 1)) / 5]).collect()
    };
    let mut screen: Vec<(f64, f64)> = grid
        .points
        .iter()
        .map(|g| {
            let p = view.project(g.p);
            (p.0, p.1)
        })
        .collect();
    for s in &stations {
        let tip = add(s.p, s.n, axis_length);
        let p = view.project(tip);
        screen.push((p.0, p.1));
    }
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (WIDTH, 760)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let area = root
            .titled(
                &format!("The mould cavity shaded by {}", shade.short()),
                (FONT, TITLE_PX),
            )
            .map_err(err)?;
        let (left, right) = area.split_horizontally(WIDTH - 230);
        let (w, h) = left.dim_in_pixel();
        let (xr, yr) = equal_axes(&screen, w as f64 - 20.0, h as f64 - 20.0, 0.18);
        let mut chart = ChartBuilder::on(&left)
            .margin(10)
            .x_label_area_size(0)
            .y_label_area_size(0)
            .build_cartesian_2d(xr.0..xr.1, yr.0..yr.1)
            .map_err(err)?;
        draw_surface(
            &mut chart,
            grid,
            &view,
            |c| {
                let v = c.iter().map(|g| shade.value(g)).sum::<f64>() / 4.0;
                colour((v - lo) / (hi - lo))
            },
            None,
        )?;
        // The pass, its gouging stretches and the tool axes.
        let line = |pts: &[&Sample]| -> Vec<(f64, f64)> {
            pts.iter()
                .map(|s| {
                    let p = view.project(s.p);
                    (p.0, p.1)
                })
                .collect()
        };
        let all: Vec<&Sample> = pass.samples.iter().collect();
        chart
            .draw_series(std::iter::once(PathElement::new(
                line(&all),
                BLACK.stroke_width(7),
            )))
            .map_err(err)?;
        chart
            .draw_series(std::iter::once(PathElement::new(
                line(&all),
                PATH_COLOUR.stroke_width(4),
            )))
            .map_err(err)?;
        let gouges: Vec<&Stretch> = pass
            .stretches
            .iter()
            .filter(|s| s.kind == "gouge")
            .collect();
        for run in runs(&pass.samples, &gouges).iter() {
            let mut pts = line(run);
            if pts.len() == 1 {
                pts.push((pts[0].0 + 0.5, pts[0].1));
            }
            // A ring around the stretch, so a short one is seen at a glance.
            let mid = pts[pts.len() / 2];
            chart
                .draw_series(std::iter::once(Circle::new(
                    mid,
                    18,
                    FAIL_COLOUR.stroke_width(3),
                )))
                .map_err(err)?;
            chart
                .draw_series(std::iter::once(PathElement::new(
                    pts,
                    FAIL_COLOUR.stroke_width(9),
                )))
                .map_err(err)?;
        }
        for s in stations.iter() {
            let a = view.project(s.p);
            let b = view.project(add(s.p, s.n, axis_length));
            chart
                .draw_series(std::iter::once(Circle::new(
                    (a.0, a.1),
                    5,
                    AXIS_COLOUR.filled(),
                )))
                .map_err(err)?;
            chart
                .draw_series([PathElement::new(
                    vec![(a.0, a.1), (b.0, b.1)],
                    AXIS_COLOUR.stroke_width(4),
                )])
                .map_err(err)?;
        }
        let mut busy = surface_points(grid, &view);
        busy.extend(screen.iter().copied());
        let items: Vec<LegendItem> = vec![
            ("the pass".to_string(), PASS_SWATCH),
            ("the ball gouges (ringed)".to_string(), GOUGE_SWATCH),
            (
                format!("tool axis (upright: along N), {axis_length:.0} mm"),
                Swatch::Line {
                    colour: AXIS_COLOUR,
                    width: 4,
                    dashed: false,
                },
            ),
        ];
        legend_in_corner(&chart, &items, &busy)?;
        let (gx0, gx1) = extent(grid, 0);
        let (gy0, gy1) = extent(grid, 1);
        chart
            .draw_series(std::iter::once(Text::new(
                format!(
                    "{:.0} × {:.0} mm, seen from {:.0}° above, heights drawn ×{}",
                    gx1 - gx0,
                    gy1 - gy0,
                    view.elevation.to_degrees(),
                    view.z_scale
                ),
                (xr.0 + 0.01 * (xr.1 - xr.0), yr.1 - 0.01 * (yr.1 - yr.0)),
                TextStyle::from((FONT, TICK_PX).into_font()).pos(
                    plotters::style::text_anchor::Pos::new(
                        plotters::style::text_anchor::HPos::Left,
                        plotters::style::text_anchor::VPos::Top,
                    ),
                ),
            )))
            .map_err(err)?;
        colour_bar(
            &right,
            shade.label(),
            (lo, hi),
            &values,
            limit.map(|m| ("1/r".to_string(), m)),
        )?;
        root.present().map_err(err)?;
    }
    Ok(svg)
}

/// The smallest and largest coordinate `k` of a grid's points.
fn extent(grid: &Grid, k: usize) -> (f64, f64) {
    grid.points
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), g| {
            (a.min(g.p[k]), b.max(g.p[k]))
        })
}

fn add(p: [f64; 3], d: [f64; 3], t: f64) -> [f64; 3] {
    [p[0] + t * d[0], p[1] + t * d[1], p[2] + t * d[2]]
}

/// The cavity's parameter plane (u, v), shaded by `shade`, with the knot lines and the pass.
pub fn cavity_uv(grid: &Grid, pass: &raw::MillPass, shade: Shade) -> Result<String, String> {
    let values: Vec<f64> = grid.points.iter().map(|g| shade.value(g)).collect();
    let limit = (shade == Shade::Concave).then(|| 1.0 / pass.ball_radius);
    let (lo, hi) = colour_range(&values, limit);
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (WIDTH, 840)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let area = root
            .titled(
                "The pass in the cavity's parameter plane (u, v), over its knot lines",
                (FONT, TITLE_PX),
            )
            .map_err(err)?;
        let (left, right) = area.split_horizontally(WIDTH - 230);
        // The legend below the map, outside it: the whole plane is data.
        let h_left = left.dim_in_pixel().1;
        let (left, legend_strip) = left.split_vertically(h_left - 120);
        let mut chart = ChartBuilder::on(&left)
            .margin(16)
            .x_label_area_size(60)
            .y_label_area_size(80)
            .build_cartesian_2d(0.0..1.0, 0.0..1.0)
            .map_err(err)?;
        chart
            .configure_mesh()
            .disable_mesh()
            .x_desc("u (x = 160 u mm)")
            .y_desc("v (y = 100 v mm)")
            .axis_desc_style((FONT, LABEL_PX))
            .label_style((FONT, TICK_PX))
            .draw()
            .map_err(err)?;
        for i in 0..grid.nu - 1 {
            for j in 0..grid.nv - 1 {
                let c = [
                    grid.at(i, j),
                    grid.at(i + 1, j),
                    grid.at(i + 1, j + 1),
                    grid.at(i, j + 1),
                ];
                let v = c.iter().map(|g| shade.value(g)).sum::<f64>() / 4.0;
                let col = colour((v - lo) / (hi - lo));
                chart
                    .draw_series(std::iter::once(Rectangle::new(
                        [(c[0].u, c[0].v), (c[2].u, c[2].v)],
                        col.filled(),
                    )))
                    .map_err(err)?;
            }
        }
        let knot_style = RGBColor(255, 255, 255).mix(0.7).stroke_width(1);
        let distinct = |k: &[f64]| {
            let mut v: Vec<f64> = k.to_vec();
            v.dedup();
            v
        };
        let (ku, kv) = (distinct(&pass.knots_u), distinct(&pass.knots_v));
        for (knots, along_u) in [(&ku, true), (&kv, false)] {
            for &k in knots.iter() {
                let pts = if along_u {
                    vec![(k, 0.0), (k, 1.0)]
                } else {
                    vec![(0.0, k), (1.0, k)]
                };
                chart
                    .draw_series(DashedLineSeries::new(pts, 6, 6, knot_style))
                    .map_err(err)?;
            }
        }
        let uv: Vec<(f64, f64)> = pass.samples.iter().map(|s| (s.u, s.v)).collect();
        chart
            .draw_series(std::iter::once(PathElement::new(
                uv.clone(),
                BLACK.stroke_width(7),
            )))
            .map_err(err)?;
        chart
            .draw_series(std::iter::once(PathElement::new(
                uv,
                PATH_COLOUR.stroke_width(4),
            )))
            .map_err(err)?;
        let gouges: Vec<&Stretch> = pass
            .stretches
            .iter()
            .filter(|s| s.kind == "gouge")
            .collect();
        for run in runs(&pass.samples, &gouges).iter() {
            let mut pts: Vec<(f64, f64)> = run.iter().map(|s| (s.u, s.v)).collect();
            if pts.len() == 1 {
                pts.push((pts[0].0 + 0.002, pts[0].1));
            }
            let mid = pts[pts.len() / 2];
            chart
                .draw_series(std::iter::once(Circle::new(
                    mid,
                    18,
                    FAIL_COLOUR.stroke_width(3),
                )))
                .map_err(err)?;
            chart
                .draw_series(std::iter::once(PathElement::new(
                    pts,
                    FAIL_COLOUR.stroke_width(9),
                )))
                .map_err(err)?;
        }
        draw_legend(
            &legend_strip,
            (96, 8),
            &[
                (
                    "knot lines".to_string(),
                    Swatch::Line {
                        colour: BLACK,
                        width: 1,
                        dashed: true,
                    },
                ),
                ("the pass".to_string(), PASS_SWATCH),
                ("the ball gouges (ringed)".to_string(), GOUGE_SWATCH),
            ],
        )?;
        colour_bar(
            &right,
            shade.label(),
            (lo, hi),
            &values,
            limit.map(|m| ("1/r".to_string(), m)),
        )?;
        root.present().map_err(err)?;
    }
    Ok(svg)
}

/// The fibre course on the wing skin (3D), its steering and twist violations marked, and the
/// two checked quantities along the course against their limits.
pub fn wing_course(wing: &Grid, course: &raw::Course) -> Result<String, String> {
    let view = View {
        azimuth: -0.3,
        elevation: 0.75,
        z_scale: 3.0,
    };
    let samples = &course.samples;
    let knots: Vec<f64> = Vec::new();
    let length = path_length(samples);
    let kinds = |k: &str| {
        course
            .stretches
            .iter()
            .filter(|s| s.kind == k)
            .collect::<Vec<_>>()
    };
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (WIDTH, 1240)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let area = root
            .titled(
                "A fibre course on the wing skin: where it steers or twists too much",
                (FONT, TITLE_PX),
            )
            .map_err(err)?;
        let (top, bottom) = area.split_vertically(520);
        let screen: Vec<(f64, f64)> = wing
            .points
            .iter()
            .map(|g| {
                let p = view.project(g.p);
                (p.0, p.1)
            })
            .collect();
        let (w, h) = top.dim_in_pixel();
        let (xr, yr) = equal_axes(&screen, w as f64 - 20.0, h as f64 - 20.0, 0.1);
        let mut chart = ChartBuilder::on(&top)
            .margin(10)
            .build_cartesian_2d(xr.0..xr.1, yr.0..yr.1)
            .map_err(err)?;
        let (z0, z1) = range(wing.points.iter().map(|g| g.p[2]));
        draw_surface(
            &mut chart,
            wing,
            &view,
            |c| {
                // Light shading by height: the upper third of the colour map, so the course and
                // its marks stay readable on it.
                let z = c.iter().map(|g| g.p[2]).sum::<f64>() / 4.0;
                colour(0.55 + 0.4 * (z - z0) / (z1 - z0))
            },
            Some(RGBColor(120, 120, 120)),
        )?;
        let line = |pts: &[&Sample]| -> Vec<(f64, f64)> {
            pts.iter()
                .map(|s| {
                    let p = view.project(s.p);
                    (p.0, p.1)
                })
                .collect()
        };
        let all: Vec<&Sample> = samples.iter().collect();
        chart
            .draw_series(std::iter::once(PathElement::new(
                line(&all),
                COURSE_COLOUR.stroke_width(4),
            )))
            .map_err(err)?;
        for (kind, c, width) in [("steering", FAIL_COLOUR, 12), ("twist", FAIL_COLOUR_2, 6)] {
            for run in runs(samples, &kinds(kind)).iter() {
                chart
                    .draw_series(std::iter::once(PathElement::new(
                        line(run),
                        c.stroke_width(width),
                    )))
                    .map_err(err)?;
            }
        }
        let mut busy = surface_points(wing, &view);
        busy.extend(line(&all));
        let items: Vec<LegendItem> = vec![
            (
                format!("the course ({} mm tow)", course.tow_width),
                Swatch::Line {
                    colour: COURSE_COLOUR,
                    width: 4,
                    dashed: false,
                },
            ),
            (
                "steering radius too small".to_string(),
                Swatch::Line {
                    colour: FAIL_COLOUR,
                    width: 12,
                    dashed: false,
                },
            ),
            (
                "twist rate too high".to_string(),
                Swatch::Line {
                    colour: FAIL_COLOUR_2,
                    width: 6,
                    dashed: false,
                },
            ),
        ];
        legend_in_corner(&chart, &items, &busy)?;
        let (bx, by) = (xr.1 - 0.01 * (xr.1 - xr.0), yr.0 + 0.04 * (yr.1 - yr.0));
        chart
            .draw_series(std::iter::once(Text::new(
                format!(
                    "seen from above at {:.0}°, heights drawn ×{}; root at the left",
                    view.elevation.to_degrees(),
                    view.z_scale
                ),
                (bx, by),
                TextStyle::from((FONT, TICK_PX).into_font()).pos(
                    plotters::style::text_anchor::Pos::new(
                        plotters::style::text_anchor::HPos::Right,
                        plotters::style::text_anchor::VPos::Center,
                    ),
                ),
            )))
            .map_err(err)?;
        let panels = bottom.split_evenly((2, 1));
        let steer = Panel {
            y_label: "|κg| (1/m)",
            series: vec![(
                "steering curvature |κg|",
                along(samples, |s| 1000.0 * s.kg.abs()),
                OKABE_ITO[5],
                false,
            )],
            shaded: vec![Shading::violations(
                kinds("steering"),
                "steering radius too small",
            )],
            limits: vec![(
                format!("1/(smallest radius {:.0} mm)", course.min_radius),
                1000.0 / course.min_radius,
            )],
            y_range: None,
            knots: knots.clone(),
        };
        draw_panel(
            &panels[0],
            "Steering: the tows buckle where |κg| is above its limit",
            length,
            &steer,
        )?;
        let twist = Panel {
            y_label: "|τg| (rad/m)",
            series: vec![(
                "twist rate |τg|",
                along(samples, |s| 1000.0 * s.tg.abs()),
                OKABE_ITO[3],
                false,
            )],
            shaded: vec![Shading::violations(kinds("twist"), "twist rate too high")],
            limits: vec![(
                format!("limit {:.3} rad/m", 1000.0 * course.max_twist),
                1000.0 * course.max_twist,
            )],
            y_range: None,
            knots: knots.clone(),
        };
        draw_panel(
            &panels[1],
            "Twist: the tow turns about its own axis by τg",
            length,
            &twist,
        )?;
        root.present().map_err(err)?;
    }
    Ok(svg)
}

/// The legend swatch of a path drawn on a surface (white over black).
const PASS_SWATCH: Swatch = Swatch::Cased {
    inner: PATH_COLOUR,
    inner_width: 4,
    outer: RGBColor(0, 0, 0),
    outer_width: 7,
};
/// The legend swatch of a gouging stretch.
const GOUGE_SWATCH: Swatch = Swatch::Line {
    colour: FAIL_COLOUR,
    width: 9,
    dashed: false,
};

/// The colour of a band edge in the courses picture.
pub const EDGE_COLOUR: RGBColor = RGBColor(0, 0, 0);
/// The colour of a gap between neighbouring bands (vermillion, solid marks).
pub const GAP_COLOUR: RGBColor = OKABE_ITO[6];
/// The colour of an overlap of neighbouring bands (blue, dashed marks).
pub const OVERLAP_COLOUR: RGBColor = OKABE_ITO[5];
/// The fill of a band in the courses picture.
pub const BAND_FILL: RGBColor = RGBColor(232, 228, 214);

/// The edge points of `edge` with arc length in [a, b], the ends interpolated linearly
/// between the edge samples on either side, as (u, v).
pub fn edge_between(edge: &[raw::EdgePoint], a: f64, b: f64) -> Vec<(f64, f64)> {
    let at = |s: f64| -> (f64, f64) {
        let k = edge
            .windows(2)
            .position(|w| s >= w[0].s && s <= w[1].s)
            .unwrap_or(if s < edge[0].s { 0 } else { edge.len() - 2 });
        let (p, q) = (&edge[k], &edge[k + 1]);
        let f = ((s - p.s) / (q.s - p.s)).clamp(0.0, 1.0);
        (p.u + f * (q.u - p.u), p.v + f * (q.v - p.v))
    };
    let mut out = vec![at(a)];
    out.extend(
        edge.iter()
            .filter(|e| e.s > a && e.s < b)
            .map(|e| (e.u, e.v)),
    );
    out.push(at(b));
    out
}

/// The planned courses on the wing skin seen in its parameter plane (x, y in mm): each band
/// between its two edges, the gaps and overlaps between neighbours marked on the first
/// course's left edge (gaps solid vermillion, overlaps dashed blue), and below, the same
/// intervals along each pair's first course with their widest width.
pub fn wing_gaps(wing: &Grid, courses: &raw::Courses) -> Result<String, String> {
    if courses.bands.len() < 2 {
        return Err("the raw output has no band edges of two or more planned courses".into());
    }
    let (x0, x1) = (
        wing.points
            .iter()
            .map(|g| g.u)
            .fold(f64::INFINITY, f64::min),
        wing.points
            .iter()
            .map(|g| g.u)
            .fold(f64::NEG_INFINITY, f64::max),
    );
    let (y0, y1) = (
        wing.points
            .iter()
            .map(|g| g.v)
            .fold(f64::INFINITY, f64::min),
        wing.points
            .iter()
            .map(|g| g.v)
            .fold(f64::NEG_INFINITY, f64::max),
    );
    let pairs = courses.bands.len().saturating_sub(1);
    let gap_items: Vec<LegendItem> = vec![
        (
            format!("band edge ({:.1} mm band)", courses.band_width),
            Swatch::Line {
                colour: EDGE_COLOUR,
                width: 2,
                dashed: false,
            },
        ),
        (
            format!("gap between neighbours (over {} mm)", courses.tolerance),
            Swatch::Line {
                colour: GAP_COLOUR,
                width: 8,
                dashed: false,
            },
        ),
        (
            format!("overlap of neighbours (over {} mm)", courses.tolerance),
            Swatch::Line {
                colour: OVERLAP_COLOUR,
                width: 8,
                dashed: true,
            },
        ),
    ];
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (WIDTH, 1080)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let area = root
            .titled(
                "Planned courses side by side on the wing skin: gaps and overlaps between them",
                (FONT, TITLE_PX),
            )
            .map_err(err)?;
        let (top, bottom) = area.split_vertically(600);
        let (plan, legend_strip) = top.split_vertically(600 - 150);
        let (margin, x_area, y_area) = (16, 60, 90);
        let (pw, ph) = plan.dim_in_pixel();
        let (w, h) = (
            (pw as i32 - 2 * margin - y_area) as f64,
            (ph as i32 - 2 * margin - x_area) as f64,
        );
        // Equal scales: widen whichever range is short for its side.
        let scale = ((x1 - x0) / w).max((y1 - y0) / h);
        let (xr, yr) = ((x0, x0 + scale * w), (y0, y0 + scale * h));
        let mut chart = ChartBuilder::on(&plan)
            .margin(margin as u32)
            .x_label_area_size(x_area as u32)
            .y_label_area_size(y_area as u32)
            .build_cartesian_2d(xr.0..xr.1, yr.0..yr.1)
            .map_err(err)?;
        chart
            .configure_mesh()
            .disable_mesh()
            .x_desc("u = x along the span (mm)")
            .y_desc("v = y from the leading edge (mm)")
            .axis_desc_style((FONT, LABEL_PX))
            .label_style((FONT, TICK_PX))
            .x_label_formatter(&tick_format(xr.1 - xr.0))
            .y_label_formatter(&tick_format(yr.1 - yr.0))
            .draw()
            .map_err(err)?;
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(x0, y0), (x1, y1)],
                RGBColor(120, 120, 120).stroke_width(1),
            )))
            .map_err(err)?;
        let uv = |e: &[raw::EdgePoint]| e.iter().map(|p| (p.u, p.v)).collect::<Vec<_>>();
        for (k, band) in courses.bands.iter().enumerate() {
            let mut outline = uv(&band.right);
            outline.extend(uv(&band.left).into_iter().rev());
            chart
                .draw_series(std::iter::once(Polygon::new(outline, BAND_FILL.filled())))
                .map_err(err)?;
            for edge in [&band.right, &band.left] {
                chart
                    .draw_series(std::iter::once(PathElement::new(
                        uv(edge),
                        EDGE_COLOUR.stroke_width(2),
                    )))
                    .map_err(err)?;
            }
            let start = (
                0.5 * (band.right[0].u + band.left[0].u),
                0.5 * (band.right[0].v + band.left[0].v),
            );
            chart
                .draw_series(std::iter::once(Text::new(
                    format!("{k}"),
                    (start.0 - 0.012 * (xr.1 - xr.0), start.1),
                    TextStyle::from((FONT, TICK_PX).into_font()).pos(
                        plotters::style::text_anchor::Pos::new(
                            plotters::style::text_anchor::HPos::Right,
                            plotters::style::text_anchor::VPos::Center,
                        ),
                    ),
                )))
                .map_err(err)?;
        }
        for seam in &courses.seams {
            let pts = edge_between(&courses.bands[seam.course].left, seam.start, seam.end);
            if seam.overlap {
                chart
                    .draw_series(DashedLineSeries::new(
                        pts,
                        14,
                        8,
                        OVERLAP_COLOUR.stroke_width(8),
                    ))
                    .map_err(err)?;
            } else {
                chart
                    .draw_series(std::iter::once(PathElement::new(
                        pts,
                        GAP_COLOUR.stroke_width(8),
                    )))
                    .map_err(err)?;
            }
        }
        // The legend and a note below the plan, outside its plotting area.
        draw_legend(&legend_strip, (margin + y_area, 4), &gap_items)?;
        let note = format!(
            "courses numbered at their start; the widths (below) are far under the scale of this \
             plan: {:.2} mm per pixel",
            scale
        );
        legend_strip
            .draw(&Text::new(
                note,
                (margin + y_area, 142),
                TextStyle::from((FONT, TICK_PX - 3).into_font()).pos(
                    plotters::style::text_anchor::Pos::new(
                        plotters::style::text_anchor::HPos::Left,
                        plotters::style::text_anchor::VPos::Bottom,
                    ),
                ),
            ))
            .map_err(err)?;
        // Along each pair's first course: the intervals as bars, one row per pair.
        let length = courses
            .bands
            .iter()
            .filter_map(|b| b.left.last().map(|e| e.s))
            .chain(courses.seams.iter().map(|s| s.end))
            .fold(1.0, f64::max);
        let rows = pairs.max(1) as f64;
        let bottom = bottom
            .titled(
                "Along each pair of neighbours: where the bands part (gap) or cover each other",
                (FONT, LABEL_PX + 2),
            )
            .map_err(err)?;
        let mut chart = ChartBuilder::on(&bottom)
            .margin(16)
            .margin_right(28)
            .x_label_area_size(56)
            .y_label_area_size(150)
            .build_cartesian_2d(0.0..length, -0.5..rows - 0.5)
            .map_err(err)?;
        chart
            .configure_mesh()
            .disable_y_mesh()
            .bold_line_style(RGBColor(225, 225, 225))
            .light_line_style(TRANSPARENT)
            .x_desc("arc length along the pair's first course s (mm)")
            .axis_desc_style((FONT, LABEL_PX))
            .label_style((FONT, TICK_PX))
            .x_labels(10)
            .x_label_formatter(&tick_format(length))
            .y_labels(0)
            .draw()
            .map_err(err)?;
        for k in 0..pairs {
            let y = (pairs - 1 - k) as f64;
            chart
                .draw_series(std::iter::once(Text::new(
                    format!("courses {k} | {}", k + 1),
                    (-0.01 * length, y),
                    TextStyle::from((FONT, TICK_PX).into_font()).pos(
                        plotters::style::text_anchor::Pos::new(
                            plotters::style::text_anchor::HPos::Right,
                            plotters::style::text_anchor::VPos::Center,
                        ),
                    ),
                )))
                .map_err(err)?;
            let here: Vec<&raw::Seam> = courses.seams.iter().filter(|s| s.course == k).collect();
            if here.is_empty() {
                chart
                    .draw_series(std::iter::once(Text::new(
                        format!("no gap or overlap over {} mm", courses.tolerance),
                        (0.02 * length, y),
                        TextStyle::from((FONT, TICK_PX).into_font()).pos(
                            plotters::style::text_anchor::Pos::new(
                                plotters::style::text_anchor::HPos::Left,
                                plotters::style::text_anchor::VPos::Center,
                            ),
                        ),
                    )))
                    .map_err(err)?;
            }
            for seam in here {
                let (c, what) = if seam.overlap {
                    (OVERLAP_COLOUR, "overlap")
                } else {
                    (GAP_COLOUR, "gap")
                };
                chart
                    .draw_series(std::iter::once(Rectangle::new(
                        [(seam.start, y - 0.28), (seam.end, y + 0.28)],
                        c.mix(0.55).filled(),
                    )))
                    .map_err(err)?;
                if seam.overlap {
                    for yy in [y - 0.28, y + 0.28] {
                        chart
                            .draw_series(DashedLineSeries::new(
                                [(seam.start, yy), (seam.end, yy)],
                                10,
                                6,
                                c.stroke_width(3),
                            ))
                            .map_err(err)?;
                    }
                }
                let right = seam.end > 0.6 * length;
                let (x, anchor) = if right {
                    (
                        seam.start - 0.01 * length,
                        plotters::style::text_anchor::HPos::Right,
                    )
                } else {
                    (
                        seam.end + 0.01 * length,
                        plotters::style::text_anchor::HPos::Left,
                    )
                };
                chart
                    .draw_series(std::iter::once(Text::new(
                        format!("{what} up to {:.2} mm", seam.width),
                        (x, y),
                        TextStyle::from((FONT, TICK_PX).into_font()).pos(
                            plotters::style::text_anchor::Pos::new(
                                anchor,
                                plotters::style::text_anchor::VPos::Center,
                            ),
                        ),
                    )))
                    .map_err(err)?;
            }
        }
        root.present().map_err(err)?;
    }
    Ok(svg)
}
