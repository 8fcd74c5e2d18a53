"""A fibre course across a wing skin, from Python: what a fibre-placement engineer plots.

The wing skin is a native NURBS surface (an invented, gently cambered and twisted panel, 2 m
span by 0.8 m chord); the course is a cubic through four points in (u, v). strake evaluates
100 000 samples of the course in one call into numpy arrays; the plot shows along the arc
length the steering curvature kg (the tow bends in the tangent plane), the twist rate tg
(the tangent plane turns about the course) and the normal curvature kn, with the process
limit on steering drawn in.

    python examples/python/wing_skin_course.py                 # prints a summary
    python examples/python/wing_skin_course.py course.png      # also plots (needs matplotlib)
"""

import sys

import numpy as np

import strake_darboux as sd

# Control net of a biquadratic wing-skin panel: 3 x 3 points (x along the span, y along the
# chord, z the camber), lifted at mid-chord and twisted toward the tip.
net = np.array(
    [
        [[0.0, 0.0, 0.00], [0.0, 0.4, 0.06], [0.0, 0.8, 0.00]],
        [[1.0, 0.0, 0.02], [1.0, 0.4, 0.09], [1.0, 0.8, 0.01]],
        [[2.0, 0.0, 0.05], [2.0, 0.4, 0.10], [2.0, 0.8, 0.00]],
    ]
)
knots = [0, 0, 0, 1, 1, 1]
skin = sd.Surface.nurbs(2, 2, knots, knots, net)
course = sd.Curve.through_uv_points([[0.05, 0.2], [0.35, 0.35], [0.65, 0.55], [0.95, 0.6]])

samples = sd.samples_at(skin, course, np.linspace(0.0, 1.0, 100_000))
s = samples["arc_length"]
f = samples["frame"]
min_steering_radius = 5.0  # m: the process limit for this tow width (invented)
steering = np.abs(f["geodesic_curvature"])
worst = sd.path_extremes(samples, steering)
over = sd.path_violations(samples, steering, 1.0 / min_steering_radius)

print(f"course length {s[-1]:.4f} m, {len(samples)} samples")
print(f"tightest steering radius {1.0 / worst['max']:.3f} m at s = {worst['max_arc_length']:.4f} m")
print(f"twist rate between {f['geodesic_torsion'].min():.4f} and {f['geodesic_torsion'].max():.4f} rad/m")
print(f"{len(over)} stretch(es) steer tighter than {min_steering_radius} m")

if len(sys.argv) > 1:
    try:
        import matplotlib

        matplotlib.use("Agg")
        import matplotlib.pyplot as plt
    except ImportError:
        sys.exit("plotting needs matplotlib: pip install matplotlib")
    fig, ax = plt.subplots(3, 1, sharex=True, figsize=(8, 7))
    ax[0].plot(s, f["geodesic_curvature"], label="kg (steering)")
    ax[0].axhline(1.0 / min_steering_radius, color="r", ls="--", label="steering limit")
    ax[0].axhline(-1.0 / min_steering_radius, color="r", ls="--")
    ax[1].plot(s, f["geodesic_torsion"], color="tab:green", label="tg (twist rate)")
    ax[2].plot(s, f["normal_curvature"], color="tab:purple", label="kn")
    ax[2].plot(s, f["k1"], color="0.6", lw=0.8, label="k1, k2")
    ax[2].plot(s, f["k2"], color="0.6", lw=0.8)
    for a, unit in zip(ax, ["1/m", "rad/m", "1/m"]):
        a.set_ylabel(unit)
        a.legend(loc="upper right")
        a.grid(alpha=0.3)
    ax[2].set_xlabel("arc length along the course [m]")
    fig.suptitle("Fibre course across a wing skin")
    fig.tight_layout()
    fig.savefig(sys.argv[1], dpi=120)
    print(f"plot written to {sys.argv[1]}")
