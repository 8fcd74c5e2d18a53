//! The demo's pictures (`examples/plots/`), drawn from small made-up data and read back: each
//! SVG must parse as XML (roxmltree) and carry its title, axis labels with units, legend
//! labels and series; the shaded violation intervals must sit at the arc lengths they stand
//! for, and the drawn series at their values, read through the axis tick labels the way a reader
//! reads them (pixel = a + b value, fitted to the printed ticks). Then the same for the demo's
//! own numbers, with the raw lines the pictures read checked against the demo's other lines.

#[path = "support/c_build.rs"]
mod c_build;
#[path = "../examples/plots/mod.rs"]
mod plots;

use plots::raw::{
    Band, Course, Courses, Demo, EdgePoint, Grid, GridPoint, MillPass, Sample, Seam, Stretch,
};
use plots::{Shade, View};
use std::process::Command;

// ------------------------------------------------------------------------------------------
// Reading an SVG back.

struct Svg {
    texts: Vec<Text>,
    /// (fill, opacity, x, y, width, height)
    rects: Vec<(String, f64, f64, f64, f64, f64)>,
    /// (stroke, width, points)
    lines: Vec<Line>,
    /// (fill, points)
    polygons: Vec<(String, Vec<(f64, f64)>)>,
    /// (fill, x, y)
    circles: Vec<(String, f64, f64)>,
}

/// (stroke, width, points) of a polyline.
type Line = (String, f64, Vec<(f64, f64)>);

struct Text {
    x: f64,
    y: f64,
    anchor: String,
    rotated: bool,
    content: String,
}

fn points(s: &str) -> Vec<(f64, f64)> {
    s.split_whitespace()
        .map(|p| {
            let (x, y) = p.split_once(',').expect("x,y");
            (x.parse().unwrap(), y.parse().unwrap())
        })
        .collect()
}

fn read(svg: &str) -> Svg {
    let doc = roxmltree::Document::parse(svg).expect("the SVG is well-formed XML");
    let root = doc.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    let num = |n: &roxmltree::Node, a: &str| -> f64 {
        n.attribute(a)
            .unwrap_or_else(|| panic!("<{}> without {a}", n.tag_name().name()))
            .parse()
            .unwrap()
    };
    let mut out = Svg {
        texts: vec![],
        rects: vec![],
        lines: vec![],
        polygons: vec![],
        circles: vec![],
    };
    for n in root.descendants().filter(|n| n.is_element()) {
        match n.tag_name().name() {
            "text" => out.texts.push(Text {
                x: num(&n, "x"),
                y: num(&n, "y"),
                anchor: n.attribute("text-anchor").unwrap_or("start").to_string(),
                rotated: n.attribute("transform").is_some(),
                content: n.text().unwrap_or("").trim().to_string(),
            }),
            "rect" => out.rects.push((
                n.attribute("fill").unwrap_or("").to_string(),
                n.attribute("opacity").map_or(1.0, |o| o.parse().unwrap()),
                num(&n, "x"),
                num(&n, "y"),
                num(&n, "width"),
                num(&n, "height"),
            )),
            "polyline" => out.lines.push((
                n.attribute("stroke").unwrap_or("").to_string(),
                n.attribute("stroke-width")
                    .map_or(1.0, |o| o.parse().unwrap()),
                points(n.attribute("points").unwrap()),
            )),
            "polygon" => out.polygons.push((
                n.attribute("fill").unwrap_or("").to_string(),
                points(n.attribute("points").unwrap()),
            )),
            "circle" => out.circles.push((
                n.attribute("fill").unwrap_or("").to_string(),
                num(&n, "cx"),
                num(&n, "cy"),
            )),
            _ => {}
        }
    }
    out
}

impl Svg {
    #[track_caller]
    fn has_text(&self, needle: &str) {
        assert!(
            self.texts.iter().any(|t| t.content.contains(needle)),
            "no text `{needle}` in the picture; texts: {:?}",
            self.texts.iter().map(|t| &t.content).collect::<Vec<_>>()
        );
    }

    /// The x axes: rows of numeric tick labels (same y, centred), top to bottom.
    fn x_axes(&self) -> Vec<(f64, Vec<(f64, f64)>)> {
        let mut rows: Vec<(f64, Vec<(f64, f64)>)> = Vec::new();
        for t in self
            .texts
            .iter()
            .filter(|t| t.anchor == "middle" && !t.rotated)
        {
            let Ok(v) = t.content.parse::<f64>() else {
                continue;
            };
            match rows.iter_mut().find(|r| r.0 == t.y) {
                Some(r) => r.1.push((t.x, v)),
                None => rows.push((t.y, vec![(t.x, v)])),
            }
        }
        rows.retain(|r| r.1.len() >= 3);
        rows.sort_by(|a, b| a.0.total_cmp(&b.0));
        rows
    }

    /// The y tick labels (right-aligned numbers) between two heights: the leftmost column
    /// (a colour bar's ticks stand farther right).
    fn y_ticks(&self, top: f64, bottom: f64) -> Vec<(f64, f64)> {
        let ticks: Vec<(f64, f64, f64)> = self
            .texts
            .iter()
            .filter(|t| t.anchor == "end" && !t.rotated && t.y > top && t.y < bottom)
            .filter_map(|t| Some((t.x, t.y, t.content.parse::<f64>().ok()?)))
            .collect();
        let left = ticks.iter().map(|t| t.0).fold(f64::INFINITY, f64::min);
        ticks
            .iter()
            .filter(|t| t.0 == left)
            .map(|t| (t.1, t.2))
            .collect()
    }
}

/// pixel = a + b value, fitted to the tick labels; the ticks must lie on the line to within
/// a pixel (they are printed at whole pixels).
#[track_caller]
fn fit(ticks: &[(f64, f64)]) -> (f64, f64) {
    assert!(ticks.len() >= 3, "too few tick labels: {ticks:?}");
    let n = ticks.len() as f64;
    let mv = ticks.iter().map(|t| t.1).sum::<f64>() / n;
    let mp = ticks.iter().map(|t| t.0).sum::<f64>() / n;
    let b = ticks.iter().map(|t| (t.1 - mv) * (t.0 - mp)).sum::<f64>()
        / ticks.iter().map(|t| (t.1 - mv).powi(2)).sum::<f64>();
    let a = mp - b * mv;
    for t in ticks {
        assert!(
            (a + b * t.1 - t.0).abs() <= 1.0,
            "tick {t:?} off the axis line"
        );
    }
    (a, b)
}

/// A panel of a chart against arc length: its x and y mappings and its pixel band.
struct Axes {
    x: (f64, f64),
    y: (f64, f64),
    top: f64,
    bottom: f64,
}

/// The panels of a picture, top to bottom, from its tick labels.
fn panels(svg: &Svg) -> Vec<Axes> {
    let mut top = 0.0;
    svg.x_axes()
        .into_iter()
        .map(|(y, ticks)| {
            let a = Axes {
                x: fit(&ticks),
                y: fit(&svg.y_ticks(top, y)),
                top,
                bottom: y,
            };
            top = y;
            a
        })
        .collect()
}

fn hex(c: plotters::style::RGBColor) -> String {
    format!("#{:02X}{:02X}{:02X}", c.0, c.1, c.2)
}

/// The shaded intervals of a panel, as arc lengths read back from the picture.
fn shaded(svg: &Svg, p: &Axes) -> Vec<(f64, f64)> {
    shaded_with(svg, p, plots::VIOLATION_FILL, plots::VIOLATION_OPACITY)
}

/// The same, for a shading of another fill and opacity.
fn shaded_with(
    svg: &Svg,
    p: &Axes,
    fill: plotters::style::RGBColor,
    opacity: f64,
) -> Vec<(f64, f64)> {
    let fill = hex(fill);
    svg.rects
        .iter()
        .filter(|r| r.0 == fill && (r.1 - opacity).abs() < 1e-9)
        // Legend swatches are 16 px high; the shading spans the plotting area.
        .filter(|r| r.5 > 40.0 && r.3 >= p.top && r.3 + r.5 <= p.bottom)
        .map(|r| ((r.2 - p.x.0) / p.x.1, (r.2 + r.4 - p.x.0) / p.x.1))
        .collect()
}

#[track_caller]
fn same_stretches(what: &str, got: &[(f64, f64)], want: &[&Stretch], p: &Axes) {
    let tol = 1.5 / p.x.1.abs();
    assert_eq!(got.len(), want.len(), "{what}: shaded {got:?}");
    for (g, w) in got.iter().zip(want) {
        assert!(
            (g.0 - w.start).abs() <= tol && (g.1 - w.end).abs() <= tol,
            "{what}: shaded {g:?}, reported {} .. {}",
            w.start,
            w.end
        );
    }
}

/// The longest polyline of a stroke colour and width (legend samples are 2 points).
fn series(svg: &Svg, colour: plotters::style::RGBColor, width: f64) -> &[(f64, f64)] {
    series_in(svg, colour, width, (f64::NEG_INFINITY, f64::INFINITY))
}

/// The same, among the polylines within a band of heights (a panel).
fn series_in(
    svg: &Svg,
    colour: plotters::style::RGBColor,
    width: f64,
    (top, bottom): (f64, f64),
) -> &[(f64, f64)] {
    let c = hex(colour);
    svg.lines
        .iter()
        .filter(|l| l.0 == c && l.1 == width)
        .filter(|l| l.2.iter().all(|q| q.1 >= top && q.1 <= bottom))
        .max_by_key(|l| l.2.len())
        .map(|l| l.2.as_slice())
        .unwrap_or_else(|| panic!("no line of colour {c}, width {width}"))
}

/// The series is drawn at its data: each point within 1.5 px of where the axes put it.
#[track_caller]
fn drawn_at(what: &str, line: &[(f64, f64)], data: &[(f64, f64)], p: &Axes) {
    assert_eq!(line.len(), data.len(), "{what}: point count");
    for (i, ((px, py), (x, y))) in line.iter().zip(data).enumerate() {
        let (ex, ey) = (p.x.0 + p.x.1 * x, p.y.0 + p.y.1 * y);
        assert!(
            (px - ex).abs() <= 1.5 && (py - ey).abs() <= 1.5,
            "{what}, point {i}: drawn at ({px}, {py}), data ({x}, {y}) maps to ({ex:.1}, {ey:.1})"
        );
    }
}

/// A limit line: dashes of the limit colour at the limit's height.
#[track_caller]
fn limit_drawn(svg: &Svg, p: &Axes, value: f64) {
    let y = p.y.0 + p.y.1 * value;
    let c = hex(plots::LIMIT_COLOUR);
    let dashes = svg
        .lines
        .iter()
        .filter(|l| l.0 == c && l.2.iter().all(|q| (q.1 - y).abs() <= 1.5))
        .count();
    assert!(dashes >= 5, "no dashed limit line at {value} (y = {y:.1})");
}

// ------------------------------------------------------------------------------------------
// Small made-up data.

fn stretch(kind: &str, start: f64, end: f64) -> Stretch {
    Stretch {
        kind: kind.to_string(),
        start,
        end,
    }
}

fn small_pass() -> MillPass {
    let samples: Vec<Sample> = (0..=40)
        .map(|i| {
            let s = 5.0 * i as f64;
            let u = 0.05 + 0.9 * s / 200.0;
            let v = 0.5 + 0.2 * (s / 40.0).sin();
            Sample {
                s,
                u,
                v,
                p: [160.0 * u, 100.0 * v, -10.0 + 0.001 * s],
                n: [0.0, 0.0, 1.0],
                kn: 0.01 * (s / 30.0).sin(),
                kg: 0.02 * (s / 40.0).cos(),
                tg: 0.005 * s / 200.0,
                k1: 0.05 + 0.1 * (-((s - 30.0) / 10.0).powi(2)).exp(),
                k2: -0.01 + 0.00005 * s,
            }
        })
        .collect();
    let scallop = samples
        .iter()
        .map(|x| 0.015 + 0.01 * (-((x.s - 115.0) / 20.0).powi(2)).exp())
        .collect();
    let feed = samples
        .iter()
        .map(|x| 250.0 - 60.0 * (-((x.s - 160.0) / 10.0).powi(2)).exp())
        .collect();
    MillPass {
        samples,
        scallop,
        feed,
        centre_feed: None,
        ball_radius: 8.0,
        scallop_limit: 0.02,
        programmed_feed: 250.0,
        stretches: vec![
            stretch("gouge", 22.5, 37.5),
            stretch("scallop", 100.0, 130.0),
            stretch("feed", 0.0, 12.5),
            stretch("feed", 150.0, 172.5),
        ],
        knots_u: vec![0.0, 0.0, 0.0, 0.0, 0.4, 1.0, 1.0, 1.0, 1.0],
        knots_v: vec![0.0, 0.0, 0.0, 0.0, 0.5, 1.0, 1.0, 1.0, 1.0],
    }
}

fn small_cavity() -> Grid {
    let (nu, nv) = (5, 4);
    let mut points = Vec::new();
    for i in 0..nu {
        for j in 0..nv {
            let (u, v) = (i as f64 / 4.0, j as f64 / 3.0);
            let k1 = 0.2 * u - 0.02 + 0.01 * v;
            let k2 = -0.01;
            points.push(GridPoint {
                u,
                v,
                p: [160.0 * u, 100.0 * v, -10.0 + 8.0 * (u - 0.5).powi(2)],
                k1,
                k2,
                h: 0.5 * (k1 + k2),
                k: k1 * k2,
            });
        }
    }
    Grid { nu, nv, points }
}

fn small_wing() -> (Grid, Course) {
    let (nu, nv) = (4, 3);
    let mut points = Vec::new();
    for i in 0..nu {
        for j in 0..nv {
            let (x, y) = (800.0 * i as f64, 450.0 * j as f64);
            points.push(GridPoint {
                u: x,
                v: y,
                p: [x, y, 60.0 * (y / 900.0) * (1.0 - y / 900.0) * 4.0],
                ..GridPoint::default()
            });
        }
    }
    let samples = (0..=30)
        .map(|i| {
            let s = 20.0 * i as f64;
            Sample {
                s,
                u: s,
                v: 450.0,
                p: [s, 450.0, 60.0],
                n: [0.0, 0.0, 1.0],
                kg: 0.0009 * (-((s - 150.0) / 50.0).powi(2)).exp(),
                tg: 0.00005 + 0.0001 * (-((s - 375.0) / 60.0).powi(2)).exp(),
                ..Sample::default()
            }
        })
        .collect();
    let course = Course {
        samples,
        tow_width: 6.35,
        min_radius: 1350.0,
        max_twist: 1e-4,
        stretches: vec![
            stretch("steering", 100.0, 200.0),
            stretch("twist", 300.0, 450.0),
        ],
    };
    (Grid { nu, nv, points }, course)
}

/// Three bands 50 mm wide along the span of the small wing (centre lines y = 300 + 50 k + s/20,
/// edge samples every 100 mm), with a gap planted between courses 0 and 1 on s in [300, 650]
/// and an overlap between courses 1 and 2 on [1000, 1500].
fn small_courses() -> Courses {
    let bands = (0..3)
        .map(|k| {
            let edge = |off: f64| -> Vec<EdgePoint> {
                (0..=20)
                    .map(|i| {
                        let s = 100.0 * i as f64;
                        let (u, v) = (100.0 + s, 300.0 + 50.0 * k as f64 + s / 20.0 + off);
                        EdgePoint {
                            s,
                            u,
                            v,
                            p: [u, v, 60.0],
                        }
                    })
                    .collect()
            };
            Band {
                right: edge(-25.0),
                left: edge(25.0),
            }
        })
        .collect();
    Courses {
        band_width: 50.0,
        tolerance: 0.05,
        bands,
        seams: vec![
            Seam {
                course: 0,
                start: 300.0,
                end: 650.0,
                overlap: false,
                width: 0.4,
            },
            Seam {
                course: 1,
                start: 1000.0,
                end: 1500.0,
                overlap: true,
                width: 0.25,
            },
        ],
    }
}

fn small_demo() -> Demo {
    let (wing, course) = small_wing();
    Demo {
        cavity: small_cavity(),
        pass: small_pass(),
        wing,
        course,
        courses: small_courses(),
    }
}

fn kinds<'a>(all: &'a [Stretch], kind: &str) -> Vec<&'a Stretch> {
    all.iter().filter(|s| s.kind == kind).collect()
}

// ------------------------------------------------------------------------------------------

#[test]
fn curvatures_along_the_pass_are_drawn_at_their_values() {
    let pass = small_pass();
    let svg = read(&plots::pass_curvatures(&pass).unwrap());
    for t in [
        "The Darboux frame's curvatures along the finishing pass",
        "arc length along the path s (mm)",
        "curvature (1/mm), torsion (rad/mm)",
        "normal curvature κn",
        "geodesic curvature κg",
        "geodesic torsion τg",
    ] {
        svg.has_text(t);
    }
    let p = panels(&svg);
    assert_eq!(p.len(), 1);
    let data = |f: fn(&Sample) -> f64| pass.samples.iter().map(|x| (x.s, f(x))).collect::<Vec<_>>();
    drawn_at(
        "κn",
        series(&svg, plots::OKABE_ITO[5], 3.0),
        &data(|x| x.kn),
        &p[0],
    );
    drawn_at(
        "τg",
        series(&svg, plots::OKABE_ITO[3], 3.0),
        &data(|x| x.tg),
        &p[0],
    );
    // κg is dashed: its dashes lie on the data's line.
    assert!(
        svg.lines
            .iter()
            .filter(|l| l.0 == hex(plots::OKABE_ITO[1]))
            .count()
            > 10
    );
    // The pass crosses the knot line u = 0.4 at s = 700/9 (u = 0.05 + 0.0045 s) and v = 0.5 at
    // s = 40 pi (v = 0.5 + 0.2 sin(s/40)); each is marked by a dotted vertical line.
    svg.has_text("crosses a knot line");
    for s in [700.0 / 9.0, 40.0 * std::f64::consts::PI] {
        let x = p[0].x.0 + p[0].x.1 * s;
        let dashes = svg
            .lines
            .iter()
            .filter(|l| {
                l.0 == hex(plots::KNOT_COLOUR) && l.2.iter().all(|q| (q.0 - x).abs() <= 1.5)
            })
            .count();
        assert!(dashes >= 5, "no knot-crossing mark at s = {s}");
    }
    let mut columns: Vec<(f64, usize)> = Vec::new();
    for l in svg.lines.iter().filter(|l| l.0 == hex(plots::KNOT_COLOUR)) {
        match columns.iter_mut().find(|c| (c.0 - l.2[0].0).abs() <= 1.5) {
            Some(c) => c.1 += 1,
            None => columns.push((l.2[0].0, 1)),
        }
    }
    let marked = columns.iter().filter(|c| c.1 >= 5).count();
    assert_eq!(marked, 2, "only the two crossings are marked: {columns:?}");
}

#[test]
fn checks_along_the_pass_shade_every_violation_at_its_arc_lengths() {
    let mut pass = small_pass();
    let svg = read(&plots::pass_checks(&pass).unwrap());
    for t in [
        "Where the finishing pass fails its checks (shaded), and why",
        "principal curvature (1/mm)",
        "scallop height (mm)",
        "feed (mm/min)",
        "1/r of the ball, r = 8 mm",
        "limit 0.02 mm",
        "programmed feed 15000 mm/min",
        "the ball gouges",
        "scallop above the limit",
        "programmed feed above the contact-path limit",
        "feed limit on the contact path",
        "k1 (largest, concave > 0)",
        "k2 (smallest)",
    ] {
        svg.has_text(t);
    }
    let p = panels(&svg);
    assert_eq!(p.len(), 3);
    for (k, kind) in ["gouge", "scallop", "feed"].iter().enumerate() {
        same_stretches(
            kind,
            &shaded(&svg, &p[k]),
            &kinds(&pass.stretches, kind),
            &p[k],
        );
    }
    let along = |v: &[f64], scale: f64| -> Vec<(f64, f64)> {
        pass.samples
            .iter()
            .zip(v)
            .map(|(x, y)| (x.s, scale * y))
            .collect()
    };
    let k1: Vec<f64> = pass.samples.iter().map(|x| x.k1).collect();
    let band = |a: &Axes| (a.top, a.bottom);
    drawn_at(
        "k1",
        series_in(&svg, plots::OKABE_ITO[5], 3.0, band(&p[0])),
        &along(&k1, 1.0),
        &p[0],
    );
    limit_drawn(&svg, &p[0], 1.0 / 8.0);
    limit_drawn(&svg, &p[1], 0.02);
    limit_drawn(&svg, &p[2], 15000.0);
    drawn_at(
        "scallop",
        series_in(&svg, plots::OKABE_ITO[5], 3.0, band(&p[1])),
        &along(&pass.scallop, 1.0),
        &p[1],
    );
    // The feed panel is in mm/min: 60 times the mm/s the demo prints.
    drawn_at(
        "feed",
        series_in(&svg, plots::OKABE_ITO[5], 3.0, band(&p[2])),
        &along(&pass.feed, 60.0),
        &p[2],
    );
    // Without the tool-centre feed lines, neither its series nor its shading appear.
    assert!(
        !svg.texts
            .iter()
            .any(|t| t.content.contains("tool-centre path"))
    );
    assert!(
        shaded_with(
            &svg,
            &p[2],
            plots::CENTRE_VIOLATION_FILL,
            plots::CENTRE_VIOLATION_OPACITY
        )
        .is_empty()
    );
    // With them: the centre-path limit as a dashed series and its own shading. The made-up
    // limit is 250 + 0.5 min(|s - 100| - 20, 185 - s) mm/s against a programmed 250 mm/s, so
    // the programmed feed exceeds it exactly on (80, 120) and (185, 200] (the last sample);
    // the excess is linear in s between the samples next to each crossing (s = 80, 120 and
    // 185 are samples where it is 0), so the linearly interpolated ends are exact.
    let centre: Vec<f64> = pass
        .samples
        .iter()
        .map(|x| 250.0 + 0.5 * ((x.s - 100.0).abs() - 20.0).min(185.0 - x.s))
        .collect();
    pass.centre_feed = Some(centre.clone());
    let svg = read(&plots::pass_checks(&pass).unwrap());
    svg.has_text("feed limit on the tool-centre path");
    svg.has_text("programmed feed above the tool-centre-path limit");
    let p = panels(&svg);
    assert_eq!(p.len(), 3);
    let want = [
        stretch("centre", 80.0, 120.0),
        stretch("centre", 185.0, 200.0),
    ];
    same_stretches(
        "centre feed",
        &shaded_with(
            &svg,
            &p[2],
            plots::CENTRE_VIOLATION_FILL,
            plots::CENTRE_VIOLATION_OPACITY,
        ),
        &want.iter().collect::<Vec<_>>(),
        &p[2],
    );
    // The contact path's intervals are still there, in their own fill.
    same_stretches(
        "feed",
        &shaded(&svg, &p[2]),
        &kinds(&pass.stretches, "feed"),
        &p[2],
    );
    // Each centre interval has dashed ends at its arc lengths.
    for s in [80.0, 120.0, 185.0, 200.0] {
        let x = p[2].x.0 + p[2].x.1 * s;
        let dashes = svg
            .lines
            .iter()
            .filter(|l| l.0 == hex(plots::CENTRE_VIOLATION_EDGE) && l.1 == 2.0)
            .filter(|l| {
                l.2.iter()
                    .all(|q| (q.0 - x).abs() <= 1.5 && q.1 >= p[2].top && q.1 <= p[2].bottom)
            })
            .count();
        assert!(dashes >= 5, "no dashed end of a centre interval at s = {s}");
    }
    // The centre-path limit is drawn dashed at its values (mm/min), over the whole pass.
    let data = along(&centre, 60.0);
    let on_data = dashes_on(&svg, plots::OKABE_ITO[1], 3.0, &data, &p[2]);
    assert!(on_data > 20, "centre series: {on_data} dashes");
}

/// The dashes of a dashed series (polylines of a colour and width in a panel) lie on the
/// data's line: each dash point within 1.5 px of the linear interpolation of the data, and the
/// dashes span the data's arc lengths. Returns the number of dashes.
#[track_caller]
fn dashes_on(
    svg: &Svg,
    colour: plotters::style::RGBColor,
    width: f64,
    data: &[(f64, f64)],
    p: &Axes,
) -> usize {
    let at = |x: f64| -> f64 {
        let k = data
            .windows(2)
            .position(|w| x >= w[0].0 && x <= w[1].0)
            .unwrap_or_else(|| panic!("dash at s = {x} off the data"));
        let (a, b) = (data[k], data[k + 1]);
        a.1 + (x - a.0) / (b.0 - a.0) * (b.1 - a.1)
    };
    let c = hex(colour);
    let boxes = legend_boxes(svg);
    let in_legend = |q: &(f64, f64)| {
        boxes
            .iter()
            .any(|b| q.0 >= b.0 && q.0 <= b.0 + b.2 && q.1 >= b.1 && q.1 <= b.1 + b.3)
    };
    let dashes: Vec<&Line> = svg
        .lines
        .iter()
        .filter(|l| l.0 == c && l.1 == width && !l.2.iter().any(in_legend))
        .filter(|l| {
            l.2.iter()
                .all(|q| q.1 >= p.top && q.1 <= p.bottom && q.0 >= p.x.0 - 1.0)
        })
        .collect();
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for l in &dashes {
        for &(px, py) in &l.2 {
            let s = ((px - p.x.0) / p.x.1).clamp(data[0].0, data[data.len() - 1].0);
            let want = p.y.0 + p.y.1 * at(s);
            // A dash of a steep stretch: its end is within 1.5 px of the line in x or in y.
            let near = (py - want).abs() <= 1.5
                || [-1.5, 1.5].iter().any(|d: &f64| {
                    let s2 = ((px + d - p.x.0) / p.x.1).clamp(data[0].0, data[data.len() - 1].0);
                    let w2 = p.y.0 + p.y.1 * at(s2);
                    (py - want) * (py - w2) <= 0.0
                });
            assert!(
                near,
                "dash point ({px}, {py}) at s = {s:.2} off the data (y = {want:.1})"
            );
            lo = lo.min(s);
            hi = hi.max(s);
        }
    }
    let span = data[data.len() - 1].0 - data[0].0;
    assert!(
        lo - data[0].0 < 0.03 * span && data[data.len() - 1].0 - hi < 0.03 * span,
        "the dashes span s = {lo} .. {hi} only"
    );
    dashes.len()
}

/// Legend boxes: (x, y, width, height) of the white boxes behind legends.
fn legend_boxes(svg: &Svg) -> Vec<(f64, f64, f64, f64)> {
    svg.rects
        .iter()
        .filter(|r| r.0 == "#FFFFFF" && (r.1 - 0.92).abs() < 1e-9)
        .map(|r| (r.2, r.3, r.4, r.5))
        .collect()
}

/// No point of a drawn series (a polyline of more than 2 points, 3 px or wider) lies inside a
/// legend box: legends hide no data.
#[track_caller]
fn legends_hide_no_data(what: &str, svg: &Svg) {
    let boxes = legend_boxes(svg);
    assert!(!boxes.is_empty(), "{what}: no legend");
    for b in &boxes {
        for l in svg.lines.iter().filter(|l| l.2.len() > 2 && l.1 >= 3.0) {
            for q in &l.2 {
                assert!(
                    !(q.0 > b.0 && q.0 < b.0 + b.2 && q.1 > b.1 && q.1 < b.1 + b.3),
                    "{what}: a point {q:?} of a {} line under the legend {b:?}",
                    l.0
                );
            }
        }
    }
}

#[test]
fn legend_swatches_match_their_series_and_hide_no_data() {
    let pass = small_pass();
    let svg = read(&plots::pass_checks(&pass).unwrap());
    legends_hide_no_data("pass checks", &svg);
    // The row of a label: its swatch is the polylines left of the text, within 3 px of its y.
    let swatch = |label: &str, colour: plotters::style::RGBColor| -> Vec<&Line> {
        let t = svg
            .texts
            .iter()
            .find(|t| t.content == label)
            .unwrap_or_else(|| panic!("no legend label {label}"));
        svg.lines
            .iter()
            .filter(|l| l.0 == hex(colour) && l.2.len() == 2)
            .filter(|l| {
                l.2.iter()
                    .all(|q| (q.1 - t.y).abs() <= 3.0 && q.0 < t.x && q.0 > t.x - 60.0)
            })
            .collect()
    };
    // k1 is solid: one stroke; k2 is dashed: several, of the series' width.
    let k1 = swatch("k1 (largest, concave > 0)", plots::OKABE_ITO[5]);
    assert_eq!(k1.len(), 1);
    let k2 = swatch("k2 (smallest)", plots::OKABE_ITO[3]);
    assert!(k2.len() >= 3, "k2's swatch is not dashed: {k2:?}");
    assert!(k2.iter().all(|l| l.1 == 3.0));
    // The limit line is dashed, and so is its swatch.
    assert!(swatch("1/r of the ball, r = 8 mm", plots::LIMIT_COLOUR).len() >= 3);
    for (name, pic) in [
        ("curvatures", plots::pass_curvatures(&pass).unwrap()),
        ("wing", {
            let (wing, course) = small_wing();
            plots::wing_course(&wing, &course).unwrap()
        }),
        (
            "cavity 3d",
            plots::cavity_3d(&small_cavity(), &pass, Shade::Concave).unwrap(),
        ),
        (
            "cavity uv",
            plots::cavity_uv(&small_cavity(), &pass, Shade::Concave).unwrap(),
        ),
        (
            "courses",
            plots::wing_gaps(&small_wing().0, &small_courses()).unwrap(),
        ),
    ] {
        legends_hide_no_data(name, &read(&pic));
    }
}

/// The cividis colour of x in [0, 1], interpolated from the published table (written here
/// again, independently of the module's function).
fn cividis_at(x: f64) -> [f64; 3] {
    let t = &plots::cividis::CIVIDIS;
    let f = x.clamp(0.0, 1.0) * 255.0;
    let i = (f as usize).min(254);
    let w = f - i as f64;
    [0, 1, 2].map(|k| 255.0 * (t[i][k] + w * (t[i + 1][k] - t[i][k])))
}

fn rgb(fill: &str) -> [f64; 3] {
    let h = |k: usize| u8::from_str_radix(&fill[1 + 2 * k..3 + 2 * k], 16).unwrap() as f64;
    [h(0), h(1), h(2)]
}

#[test]
fn colour_map_is_the_published_cividis_table() {
    let t = &plots::cividis::CIVIDIS;
    assert_eq!(t.len(), 256);
    // The ends and the middle of the published table (Nuñez, Anderton & Renslow 2018, as
    // matplotlib ships it): dark blue to yellow.
    assert_eq!(t[0], [0.0, 0.135112, 0.304751]);
    assert_eq!(t[255], [0.995737, 0.909344, 0.217772]);
    // Lightness rises monotonically: the green channel (the largest weight in luminance)
    // increases along the table.
    assert!(t.windows(2).all(|w| w[1][1] > w[0][1]));
    for x in [0.0, 0.3, 0.5, 0.77, 1.0] {
        let c = plots::colour(x);
        let e = cividis_at(x);
        assert!((c.0 as f64 - e[0]).abs() <= 0.5 + 1e-9);
        assert!((c.1 as f64 - e[1]).abs() <= 0.5 + 1e-9);
        assert!((c.2 as f64 - e[2]).abs() <= 0.5 + 1e-9);
    }
}

#[test]
fn cavity_in_3d_is_shaded_by_the_chosen_curvature() {
    let (grid, pass) = (small_cavity(), small_pass());
    for (word, shade) in Shade::ALL {
        assert_eq!(Shade::from_word(word).unwrap(), shade);
        let svg = read(&plots::cavity_3d(&grid, &pass, shade).unwrap());
        svg.has_text(shade.label());
        svg.has_text(shade.short());
        svg.has_text("heights drawn ×2");
        // One filled quadrilateral per grid cell, in the colour of its corners' mean value
        // on the colour bar's range.
        assert_eq!(svg.polygons.len(), (grid.nu - 1) * (grid.nv - 1));
        let values: Vec<f64> = grid.points.iter().map(|g| shade.value(g)).collect();
        let limit = (shade == Shade::Concave).then_some(1.0 / pass.ball_radius);
        let (lo, hi) = plots::colour_range(&values, limit);
        let mut want: Vec<[f64; 3]> = Vec::new();
        for i in 0..grid.nu - 1 {
            for j in 0..grid.nv - 1 {
                let m = [(i, j), (i + 1, j), (i + 1, j + 1), (i, j + 1)]
                    .iter()
                    .map(|&(a, b)| shade.value(grid.at(a, b)))
                    .sum::<f64>()
                    / 4.0;
                want.push(cividis_at((m - lo) / (hi - lo)));
            }
        }
        for (fill, _) in &svg.polygons {
            let c = rgb(fill);
            let k = want
                .iter()
                .position(|w| (0..3).all(|q| (w[q] - c[q]).abs() <= 0.5 + 1e-9))
                .unwrap_or_else(|| panic!("{word}: quad colour {fill} is no cell's colour"));
            want.swap_remove(k);
        }
        // The colour bar runs from the low end (bottom) to the high end (top) of the map.
        let bar: Vec<_> = svg
            .rects
            .iter()
            .filter(|r| r.4 > 20.0 && r.4 < 200.0 && r.5 < 20.0)
            .collect();
        assert!(bar.len() >= 64, "{word}: colour bar of {} steps", bar.len());
        let top = bar.iter().min_by(|a, b| a.3.total_cmp(&b.3)).unwrap();
        let bottom = bar.iter().max_by(|a, b| a.3.total_cmp(&b.3)).unwrap();
        assert!(rgb(&top.0)[1] > 200.0 && rgb(&bottom.0)[1] < 60.0);
        // The pass (white over black), its gouging stretch, and six tool axes.
        let white = series(&svg, plots::PATH_COLOUR, 4.0);
        assert_eq!(white.len(), pass.samples.len());
        let in_gouge = pass
            .samples
            .iter()
            .filter(|x| x.s >= 22.5 && x.s <= 37.5)
            .count();
        assert_eq!(series(&svg, plots::FAIL_COLOUR, 9.0).len(), in_gouge);
        let axes = svg
            .circles
            .iter()
            .filter(|c| c.0 == hex(plots::AXIS_COLOUR))
            .count();
        assert_eq!(axes, 6);
        // The pass is drawn where the projection puts it: its screen shape is the projected
        // shape up to one scale and shift (equal axes).
        let view = View {
            azimuth: -0.42,
            elevation: 0.95,
            z_scale: 2.0,
        };
        let proj: Vec<(f64, f64, f64)> = pass.samples.iter().map(|x| view.project(x.p)).collect();
        let (a, b) = (proj[0], proj[proj.len() - 1]);
        let (pa, pb) = (white[0], white[white.len() - 1]);
        let scale = (pb.0 - pa.0) / (b.0 - a.0);
        for (q, w) in proj.iter().zip(white) {
            assert!((pa.0 + scale * (q.0 - a.0) - w.0).abs() <= 1.5);
            assert!((pa.1 - scale * (q.1 - a.1) - w.1).abs() <= 1.5);
        }
        if shade == Shade::Concave {
            svg.has_text("1/r");
        }
    }
}

#[test]
fn parameter_plane_map_draws_the_pass_at_its_u_v() {
    let (grid, pass) = (small_cavity(), small_pass());
    let svg = read(&plots::cavity_uv(&grid, &pass, Shade::Concave).unwrap());
    for t in [
        "The pass in the cavity's parameter plane (u, v), over its knot lines",
        "u (x = 160 u mm)",
        "v (y = 100 v mm)",
        "knot lines",
        "the pass",
        "the ball gouges",
        Shade::Concave.label(),
    ] {
        svg.has_text(t);
    }
    let p = panels(&svg);
    assert_eq!(p.len(), 1);
    let uv: Vec<(f64, f64)> = pass.samples.iter().map(|x| (x.u, x.v)).collect();
    drawn_at(
        "pass in (u, v)",
        series(&svg, plots::PATH_COLOUR, 4.0),
        &uv,
        &p[0],
    );
    // One cell per grid cell, spanning its (u, v) rectangle.
    let cells = svg
        .rects
        .iter()
        .filter(|r| r.0.starts_with('#') && r.0 != "#FFFFFF" && r.5 > 20.0)
        .filter(|r| r.2 >= p[0].x.0 - 1.0 && r.2 + r.4 <= p[0].x.0 + p[0].x.1 + 1.0)
        .count();
    assert_eq!(cells, (grid.nu - 1) * (grid.nv - 1));
}

#[test]
fn wing_course_marks_steering_and_twist_violations() {
    let (wing, course) = small_wing();
    let svg = read(&plots::wing_course(&wing, &course).unwrap());
    for t in [
        "A fibre course on the wing skin: where it steers or twists too much",
        "the course (6.35 mm tow)",
        "steering radius too small",
        "twist rate too high",
        "|κg| (1/m)",
        "|τg| (rad/m)",
        "1/(smallest radius 1350 mm)",
        "limit 0.100 rad/m",
    ] {
        svg.has_text(t);
    }
    assert_eq!(svg.polygons.len(), (wing.nu - 1) * (wing.nv - 1));
    assert_eq!(
        series(&svg, plots::COURSE_COLOUR, 4.0).len(),
        course.samples.len()
    );
    let inside = |a: f64, b: f64| {
        course
            .samples
            .iter()
            .filter(|x| x.s >= a && x.s <= b)
            .count()
    };
    assert_eq!(
        series(&svg, plots::FAIL_COLOUR, 12.0).len(),
        inside(100.0, 200.0)
    );
    assert_eq!(
        series(&svg, plots::FAIL_COLOUR_2, 6.0).len(),
        inside(300.0, 450.0)
    );
    let p = panels(&svg);
    assert_eq!(p.len(), 2);
    for (k, kind) in ["steering", "twist"].iter().enumerate() {
        same_stretches(
            kind,
            &shaded(&svg, &p[k]),
            &kinds(&course.stretches, kind),
            &p[k],
        );
    }
    limit_drawn(&svg, &p[0], 1000.0 / 1350.0);
    limit_drawn(&svg, &p[1], 0.1);
    let kg: Vec<(f64, f64)> = course
        .samples
        .iter()
        .map(|x| (x.s, 1000.0 * x.kg.abs()))
        .collect();
    drawn_at(
        "|κg|",
        series_in(&svg, plots::OKABE_ITO[5], 3.0, (p[0].top, p[0].bottom)),
        &kg,
        &p[0],
    );
    let tg: Vec<(f64, f64)> = course
        .samples
        .iter()
        .map(|x| (x.s, 1000.0 * x.tg.abs()))
        .collect();
    drawn_at(
        "|τg|",
        series_in(&svg, plots::OKABE_ITO[3], 3.0, (p[1].top, p[1].bottom)),
        &tg,
        &p[1],
    );
}

#[test]
fn wing_gaps_mark_gaps_and_overlaps_on_the_band_edges() {
    let (wing, _) = small_wing();
    let courses = small_courses();
    let svg = read(&plots::wing_gaps(&wing, &courses).unwrap());
    for t in [
        "Planned courses side by side on the wing skin: gaps and overlaps between them",
        "u = x along the span (mm)",
        "v = y from the leading edge (mm)",
        "band edge (50.0 mm band)",
        "gap between neighbours (over 0.05 mm)",
        "overlap of neighbours (over 0.05 mm)",
        "arc length along the pair's first course s (mm)",
        "courses 0 | 1",
        "courses 1 | 2",
        "gap up to 0.40 mm",
        "overlap up to 0.25 mm",
    ] {
        svg.has_text(t);
    }
    // The plan: its axes from the first row of x ticks and the y ticks above it.
    let rows = svg.x_axes();
    assert_eq!(
        rows.len(),
        2,
        "the plan and the intervals along the courses"
    );
    let plan = Axes {
        x: fit(&rows[0].1),
        y: fit(&svg.y_ticks(0.0, rows[0].0)),
        top: 0.0,
        bottom: rows[0].0,
    };
    // Equal scales: a millimetre is as long across as along (y grows upward).
    assert!(
        (plan.x.1 + plan.y.1).abs() <= 0.01 * plan.x.1,
        "{:?} {:?}",
        plan.x,
        plan.y
    );
    // Every edge drawn at its (u, v).
    let edges: Vec<&Line> = svg
        .lines
        .iter()
        .filter(|l| l.0 == hex(plots::EDGE_COLOUR) && l.1 == 2.0 && l.2.len() > 2)
        .collect();
    assert_eq!(edges.len(), 2 * courses.bands.len());
    for (k, band) in courses.bands.iter().enumerate() {
        for (side, edge) in [("right", &band.right), ("left", &band.left)] {
            let data: Vec<(f64, f64)> = edge.iter().map(|e| (e.u, e.v)).collect();
            let drawn = edges
                .iter()
                .find(|l| {
                    let (ex, ey) = (
                        plan.x.0 + plan.x.1 * data[0].0,
                        plan.y.0 + plan.y.1 * data[0].1,
                    );
                    (l.2[0].0 - ex).abs() <= 1.5 && (l.2[0].1 - ey).abs() <= 1.5
                })
                .unwrap_or_else(|| panic!("no {side} edge of course {k}"));
            drawn_at(
                &format!("{side} edge of course {k}"),
                &drawn.2,
                &data,
                &plan,
            );
        }
    }
    // The gap: a solid vermillion mark on course 0's left edge from s = 300 to 650 (the edge
    // there is v = 325 + s/20 at u = 100 + s; the end s = 650 lies between samples).
    let gap = series(&svg, plots::GAP_COLOUR, 8.0);
    let want: Vec<(f64, f64)> = [300.0, 400.0, 500.0, 600.0, 650.0]
        .iter()
        .map(|s| (100.0 + s, 325.0 + s / 20.0))
        .collect();
    drawn_at("gap mark", gap, &want, &plan);
    // The overlap: dashes of blue on course 1's left edge (v = 375 + s/20), s = 1000 .. 1500.
    let dashes: Vec<&Line> = svg
        .lines
        .iter()
        .filter(|l| l.0 == hex(plots::OVERLAP_COLOUR) && l.1 == 8.0)
        .filter(|l| l.2.iter().all(|q| q.1 < plan.bottom))
        .filter(|l| {
            !l.2.iter().any(|q| {
                legend_boxes(&svg)
                    .iter()
                    .any(|b| q.0 >= b.0 && q.0 <= b.0 + b.2 && q.1 >= b.1 && q.1 <= b.1 + b.3)
            })
        })
        .collect();
    assert!(dashes.len() >= 5, "overlap dashes: {}", dashes.len());
    for l in &dashes {
        for q in &l.2 {
            let u = (q.0 - plan.x.0) / plan.x.1;
            let v = (q.1 - plan.y.0) / plan.y.1;
            let s = u - 100.0;
            assert!((999.0..=1501.0).contains(&s), "overlap dash at s = {s}");
            assert!(
                (v - (375.0 + s / 20.0)).abs() * plan.x.1 <= 1.5,
                "overlap dash off the edge"
            );
        }
    }
    // The legend sits outside the plan's plotting area: below its x axis.
    let boxes = legend_boxes(&svg);
    assert_eq!(boxes.len(), 1);
    assert!(
        boxes[0].1 > rows[0].0,
        "legend {:?} not below the plan",
        boxes[0]
    );
    // Below: the intervals along each pair's first course, at their arc lengths, gaps and
    // overlaps in their own colours, one row per pair (0 | 1 above 1 | 2).
    let along = fit(&rows[1].1);
    let bar = |c: plotters::style::RGBColor| -> Vec<(f64, f64, f64)> {
        svg.rects
            .iter()
            .filter(|r| r.0 == hex(c) && (r.1 - 0.55).abs() < 1e-9 && r.3 > rows[0].0)
            .map(|r| {
                (
                    (r.2 - along.0) / along.1,
                    (r.2 + r.4 - along.0) / along.1,
                    r.3 + 0.5 * r.5,
                )
            })
            .collect()
    };
    let (g, o) = (bar(plots::GAP_COLOUR), bar(plots::OVERLAP_COLOUR));
    assert_eq!((g.len(), o.len()), (1, 1));
    let tol = 1.5 / along.1;
    assert!(
        (g[0].0 - 300.0).abs() <= tol && (g[0].1 - 650.0).abs() <= tol,
        "{g:?}"
    );
    assert!(
        (o[0].0 - 1000.0).abs() <= tol && (o[0].1 - 1500.0).abs() <= tol,
        "{o:?}"
    );
    let row_of = |label: &str| svg.texts.iter().find(|t| t.content == label).unwrap().y;
    assert!((g[0].2 - row_of("courses 0 | 1")).abs() <= 2.0);
    assert!((o[0].2 - row_of("courses 1 | 2")).abs() <= 2.0);
    // Fewer than two bands: refused with a message, not an empty picture.
    let mut one = courses.clone();
    one.bands.truncate(1);
    one.seams.clear();
    let e = plots::wing_gaps(&wing, &one).unwrap_err();
    assert!(e.contains("two or more planned courses"), "{e}");
}

#[test]
fn raw_course_edges_and_gaps_are_read() {
    let lines = "course_edge 0 right 0 0 1 2 3 4 5\n\
                 course_edge 0 left 0 0 1 3 3 5 5\n\
                 course_edge 0 right 1 10 11 2 13 4 5\n\
                 course_edge 0 left 1 10 11 3 13 5 5\n\
                 course_edge 1 right 0 0 1 3 3 5 5\n\
                 course_edge 1 left 0 0 1 4 3 6 5\n\
                 course_edge 1 right 1 10 11 3 13 5 5\n\
                 course_edge 1 left 1 10 11 4 13 6 5\n\
                 course_gap 0 2.5 7.5 0.125\n\
                 course_overlap 0 8 9 0.0625\n";
    let mut demo = String::new();
    // A minimal rest of the output, so the parse gets to the courses.
    demo.push_str("cavity_grid_size 2 2\n");
    for (i, j) in [(0, 0), (0, 1), (1, 0), (1, 1)] {
        demo.push_str(&format!("cavity_grid {i} {j} 0 0 0 0 0 0 0 0 0\n"));
    }
    demo.push_str("wing_grid_size 2 2\n");
    for (i, j) in [(0, 0), (0, 1), (1, 0), (1, 1)] {
        demo.push_str(&format!("wing_grid {i} {j} 0 0 0\n"));
    }
    demo.push_str("mill_setup 8 0 0.02 250 0 0 0 0 0\n");
    demo.push_str("course_setup 0 0 0 6.35 1350 0.0001\n");
    demo.push_str("plan_setup 50.8 0 0 0 0 0.05\n");
    for (key, n) in [("mill", 2), ("course", 2)] {
        for i in 0..n {
            demo.push_str(&format!("{key}_sample {i} 0 {i} 0 0 0\n"));
            demo.push_str(&format!("{key}_frame {i} 0 0 0 0 0 0 0 1 0 0 0 0 0\n"));
        }
    }
    let d = plots::raw::parse(&(demo.clone() + lines)).unwrap();
    let c = &d.courses;
    assert_eq!((c.band_width, c.tolerance), (50.8, 0.05));
    assert_eq!(c.bands.len(), 2);
    assert_eq!(
        c.bands[1].left[1],
        EdgePoint {
            s: 10.0,
            u: 11.0,
            v: 4.0,
            p: [13.0, 6.0, 5.0]
        }
    );
    assert_eq!(
        c.seams,
        vec![
            Seam {
                course: 0,
                start: 2.5,
                end: 7.5,
                overlap: false,
                width: 0.125
            },
            Seam {
                course: 0,
                start: 8.0,
                end: 9.0,
                overlap: true,
                width: 0.0625
            },
        ]
    );
    // Each wrong line alone (after the rest of the output), or after the edges of two courses.
    let edges = &lines[..lines.find("course_gap").unwrap()];
    for (bad, after_edges, says) in [
        (
            "course_edge 0 middle 0 0 1 2 3 4 5\n",
            false,
            "neither left nor right",
        ),
        ("course_edge 1 left 0 0 1 2 3 4 5\n", false, "out of order"),
        (
            "course_edge 0 left 1 0 1 2 3 4 5\n",
            false,
            "expected index 0",
        ),
        (
            "course_edge 0 left 0 0 1 2 3 4\n",
            false,
            "expected 7 numbers",
        ),
        (
            "course_edge 0 left 0 0 1 2 3 4 5\ncourse_edge 0 left 1 0 1 2 3 4 5\n",
            false,
            "course band edges",
        ),
        ("course_gap 0 5 4 0.1\n", true, "start <= end"),
        ("course_overlap 0 1 2 -0.1\n", true, "width >= 0"),
        ("course_gap 1 1 2 0.1\n", true, "after course 1"),
    ] {
        let text = demo.clone() + if after_edges { edges } else { "" } + bad;
        let e = plots::raw::parse(&text).unwrap_err();
        assert!(e.contains(says), "`{bad}`: {e}");
    }
}

#[test]
fn pictures_are_written_into_one_folder() {
    let dir = c_build::build_dir().unwrap().join("pictures_test");
    let _ = std::fs::remove_dir_all(&dir);
    let pictures = plots::all(&small_demo(), Shade::Mean).unwrap();
    let paths = plots::write_all(&dir, &pictures).unwrap();
    assert_eq!(paths.len(), 6);
    for p in &paths {
        assert_eq!(p.parent().unwrap(), dir);
        read(&std::fs::read_to_string(p).unwrap());
    }
}

// The demo's own numbers: the raw lines the pictures read agree with the demo's other lines
// (the same frames printed twice), and the pictures of them carry the demo's intervals.
#[test]
fn demo_pictures_show_the_demo_numbers() {
    let exe = c_build::build_dir().unwrap().join("mould_cavity_pictures");
    c_build::compile(&c_build::demo_sources(), &exe, &[]).unwrap();
    let out = Command::new(&exe).arg("--raw").output().unwrap();
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    let demo = plots::raw::parse(&text).unwrap();
    // mill_sample's concave curvature is k1 (tool on the side N points to, upright); the
    // course's steering curvature is |kg| (tests/c_demo.rs checks both against the Rust API).
    let column = |key: &str, col: usize| -> Vec<f64> {
        text.lines()
            .filter(|l| l.starts_with(&format!("{key} ")))
            .map(|l| l.split_whitespace().nth(col).unwrap().parse().unwrap())
            .collect()
    };
    let concave = column("mill_sample", 4);
    assert_eq!(concave.len(), demo.pass.samples.len());
    for (x, c) in demo.pass.samples.iter().zip(&concave) {
        assert!((x.k1 - c).abs() <= 1e-12, "k1 {} vs concave {c}", x.k1);
    }
    let steer = column("course_sample", 4);
    for (x, c) in demo.course.samples.iter().zip(&steer) {
        assert!(
            (x.kg.abs() - c).abs() <= 1e-15,
            "|kg| {} vs steering {c}",
            x.kg
        );
    }
    // The cavity grid: x = 160 u, y = 100 v (control points at the Greville abscissae: linear
    // precision, The NURBS Book 2nd ed. ch. 2 [memory]); H and K from k1, k2 (do Carmo §3-3).
    for g in &demo.cavity.points {
        assert!((g.p[0] - 160.0 * g.u).abs() < 1e-9 && (g.p[1] - 100.0 * g.v).abs() < 1e-9);
        assert!((g.h - 0.5 * (g.k1 + g.k2)).abs() <= 1e-12 * (1.0 + g.h.abs()));
        assert!((g.k - g.k1 * g.k2).abs() <= 1e-12 * (1.0 + g.k.abs()));
        assert!(g.k1 >= g.k2);
    }
    let svg = read(&plots::pass_checks(&demo.pass).unwrap());
    let p = panels(&svg);
    for (k, kind) in ["gouge", "scallop", "feed"].iter().enumerate() {
        let want = kinds(&demo.pass.stretches, kind);
        assert!(
            !want.is_empty(),
            "the demo exceeds its {kind} limit somewhere"
        );
        same_stretches(kind, &shaded(&svg, &p[k]), &want, &p[k]);
    }
    let svg = read(&plots::wing_course(&demo.wing, &demo.course).unwrap());
    let p = panels(&svg);
    for (k, kind) in ["steering", "twist"].iter().enumerate() {
        same_stretches(
            kind,
            &shaded(&svg, &p[k]),
            &kinds(&demo.course.stretches, kind),
            &p[k],
        );
    }
    // The planned courses: one band per course, the gaps and overlaps as the plan_gap lines
    // report them (plan_gap names the second course of the pair), and each band as wide as it
    // should be: the chord between an edge pair is at most the geodesic across, w (a chord is
    // never longer than an arc), and on this gently bent skin not much shorter.
    let plan_courses = text
        .lines()
        .filter(|l| l.starts_with("plan_course "))
        .count();
    assert_eq!(demo.courses.bands.len(), plan_courses);
    let plan_gaps: Vec<Vec<f64>> = text
        .lines()
        .filter(|l| l.starts_with("plan_gap "))
        .map(|l| {
            l.split_whitespace()
                .skip(1)
                .map(|x| x.parse().unwrap())
                .collect()
        })
        .collect();
    assert_eq!(demo.courses.seams.len(), plan_gaps.len());
    assert!(!plan_gaps.is_empty(), "the demo's courses part somewhere");
    for (seam, g) in demo.courses.seams.iter().zip(&plan_gaps) {
        assert_eq!(seam.course as f64, g[0] - 1.0);
        assert_eq!(
            (seam.start, seam.end, seam.overlap, seam.width),
            (g[2], g[3], g[4] == 1.0, g[5])
        );
    }
    let w = demo.courses.band_width;
    for (k, band) in demo.courses.bands.iter().enumerate() {
        assert!(
            band.left.len() >= 30,
            "course {k}: {} edge samples",
            band.left.len()
        );
        for (r, l) in band.right.iter().zip(&band.left) {
            assert_eq!(r.s, l.s);
            let chord = (0..3)
                .map(|q| (r.p[q] - l.p[q]).powi(2))
                .sum::<f64>()
                .sqrt();
            assert!(
                chord <= w * (1.0 + 1e-9) && chord > w - 0.05,
                "course {k} at s = {}: chord {chord}",
                r.s
            );
        }
        assert!(band.left.windows(2).all(|e| e[1].s > e[0].s));
    }
    let svg = read(&plots::wing_gaps(&demo.wing, &demo.courses).unwrap());
    svg.has_text("gap up to");
    for pic in plots::all(&demo, Shade::Concave).unwrap() {
        read(&pic.svg);
    }
}

// The README shows the committed copies: each exists, parses and is referenced.
#[test]
fn readme_shows_every_picture() {
    let root = c_build::root();
    let readme = std::fs::read_to_string(root.join("README.md")).unwrap();
    for pic in plots::all(&small_demo(), Shade::Concave).unwrap() {
        let path = format!("docs/pictures/{}", pic.name);
        assert!(
            readme.contains(&format!("]({path})")),
            "README lacks {path}"
        );
        read(&std::fs::read_to_string(root.join(&path)).unwrap());
    }
}

// The reader of the raw output names what is wrong instead of drawing half a picture.
#[test]
fn raw_output_errors_name_the_line() {
    let e = plots::raw::parse("mill_sample 0 0 0 x 0 0\n").unwrap_err();
    assert!(
        e.contains("`x` is not a number") && e.contains("mill_sample"),
        "{e}"
    );
    let e = plots::raw::parse("violation\n").unwrap_err();
    assert!(e.contains("without its kind"), "{e}");
    let e = plots::raw::parse("mill_sample 1 0 0 0 0 0\n").unwrap_err();
    assert!(e.contains("expected index 0"), "{e}");
    let e = plots::raw::parse("unknown line from another section\n").unwrap_err();
    assert!(e.contains("cavity grid"), "{e}");
}
