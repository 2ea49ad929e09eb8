//! SVG plots (drawn with the `plotters` crate): the coil current and the voltage across the
//! switch after switch-off, one trace per clamp option, each topology in its own colour in
//! every plot (a palette of our own, keyed by the topology, so a plain diode has one colour
//! whether it is the design or an option; the design's trace is the thicker one), one legend,
//! the switch's rating, derated limit and avalanche onset drawn, at the release corner the
//! release current and the designed clamp's release time, and the corner named.
//!
//! Work: the data are refused beyond the quantities' range (|x| ≤ 1e12 in SI units, finite),
//! so every axis range is finite and the mesh, the lines and the labels are a fixed amount of
//! drawing whatever the numbers.

use crate::host::report::plot::{Choice, Plot, View};
use plotters::prelude::*;
use std::format;
use std::string::{String, ToString};

/// The colour of a topology (as the design file names kinds), the same in every plot.
pub fn colour(topology: &str) -> RGBColor {
    match topology {
        "diode" => RGBColor(0, 109, 119),
        "resistor+diode" => RGBColor(202, 128, 0),
        "zener+diode" => RGBColor(64, 61, 160),
        "switched-freewheel" => RGBColor(128, 57, 150),
        "tvs-across-coil" => RGBColor(26, 133, 184),
        "varistor" => RGBColor(112, 112, 36),
        "tvs-across-switch" => RGBColor(186, 69, 128),
        "switch-clamp" => RGBColor(96, 96, 96),
        "avalanche" => RGBColor(171, 34, 52),
        "h-bridge" => RGBColor(140, 86, 44),
        "rc-snubber" => RGBColor(45, 140, 64),
        _ => RGBColor(0, 0, 0),
    }
}

/// The stroke of a trace: the design's thicker than the options'.
fn stroke(choice: Choice) -> u32 {
    if choice == Choice::Designed {
        3
    } else {
        2
    }
}

/// The file a plot goes to.
pub fn file_name(p: &Plot) -> String {
    match p.view {
        View::SwitchVoltage => format!("plot_{}.svg", p.module),
        View::Release => format!("plot_{}_release.svg", p.module),
    }
}

/// Current scale: mA below 1 A.
fn current_scale(i_max: f32) -> (f32, &'static str) {
    if i_max < 1.0 {
        (1e3, "mA")
    } else {
        (1.0, "A")
    }
}

/// Time scale: ms below 1 s.
fn time_scale(t_max: f32) -> (f32, &'static str) {
    if t_max < 1e-3 {
        (1e6, "µs")
    } else if t_max < 1.0 {
        (1e3, "ms")
    } else {
        (1.0, "s")
    }
}

/// Splits `text` at commas into lines of at most about `width` characters (two at most).
fn wrap(text: &str, width: usize) -> std::vec::Vec<String> {
    let mut lines = std::vec![String::new()];
    for part in text.split(", ") {
        let cur = lines.last().map_or(0, |l| l.chars().count());
        if cur > 0 && cur + part.chars().count() + 2 > width && lines.len() < 2 {
            lines.push(String::new());
        }
        if let Some(l) = lines.last_mut() {
            if !l.is_empty() {
                l.push_str(", ");
            }
            l.push_str(part);
        }
    }
    lines
}

/// The largest magnitude a plot draws (the quantities' own bound, SI units).
pub const PLOT_MAX: f32 = 1e12;

/// Refuses data a plot cannot show (the analysis never makes it: a guard): anything not
/// finite or beyond [`PLOT_MAX`], which would leave an axis range the drawing cannot bound.
fn finite(p: &Plot) -> Result<(), String> {
    let ok_x = |x: &f32| x.is_finite() && x.abs() <= PLOT_MAX;
    let series = p
        .series
        .iter()
        .all(|s| s.t.iter().chain(&s.i).chain(&s.v).all(ok_x));
    let marks = [p.rating, p.limit, p.supply]
        .iter()
        .chain(&p.avalanche)
        .chain(&p.release_current)
        .chain(&p.release_decay)
        .all(ok_x);
    if series && marks {
        Ok(())
    } else {
        Err(format!(
            "plot of {}: data not finite or beyond {PLOT_MAX:e} in SI units",
            p.name
        ))
    }
}

/// A drawing area of the SVG backend.
type Area<'a> = DrawingArea<SVGBackend<'a>, plotters::coord::Shift>;

/// The drawing library's error as text.
fn err<E: std::error::Error + Send + Sync>(x: DrawingAreaErrorKind<E>) -> String {
    x.to_string()
}

/// The scales of a plot: (time scale, unit, end), (current scale, unit, top), voltage top.
struct Scales {
    t: (f32, &'static str, f32),
    i: (f32, &'static str, f32),
    v_top: f32,
}

fn scales(p: &Plot) -> Scales {
    let t_max = p
        .series
        .iter()
        .filter_map(|s| s.t.last().copied())
        .fold(0.0f32, f32::max)
        .max(1e-9);
    let i_max = p
        .series
        .iter()
        .flat_map(|s| s.i.iter().copied())
        .fold(0.0f32, f32::max)
        .max(1e-9);
    let v_max = p
        .series
        .iter()
        .flat_map(|s| s.v.iter().copied())
        .fold(p.rating.max(p.avalanche.unwrap_or(0.0)), f32::max)
        .max(1e-9);
    let (ts, tu) = time_scale(t_max);
    let (is, iu) = current_scale(i_max);
    Scales {
        t: (ts, tu, t_max * ts),
        i: (is, iu, i_max * is * 1.05),
        v_top: v_max * 1.1,
    }
}

/// The title and the corner, wrapped.
fn head(area: &Area<'_>, p: &Plot) -> Result<(), String> {
    let at = match p.view {
        View::SwitchVoltage => "the worst switch-voltage corner",
        View::Release => "the worst release corner",
    };
    let title = format!(
        "{}: switch-off at {at} (an engineering estimate: verify on hardware)",
        p.name
    );
    area.draw(&Text::new(title, (10, 8), ("sans-serif", 14)))
        .map_err(err)?;
    for (k, line) in wrap(&p.corner, 130).iter().enumerate() {
        area.draw(&Text::new(
            line.clone(),
            (10, 28 + 15 * k as i32),
            ("sans-serif", 12),
        ))
        .map_err(err)?;
    }
    Ok(())
}

/// The current panel, with the one legend.
fn current_panel(area: &Area<'_>, p: &Plot, sc: &Scales) -> Result<(), String> {
    let (ts, tu, t_end) = sc.t;
    let (is, iu, i_top) = sc.i;
    let mut c = ChartBuilder::on(area)
        .caption("coil current", ("sans-serif", 16))
        .margin(10)
        .x_label_area_size(35)
        .y_label_area_size(60)
        .build_cartesian_2d(0f32..t_end, 0f32..i_top)
        .map_err(err)?;
    c.configure_mesh()
        .x_desc(format!("time ({tu})"))
        .y_desc(format!("current ({iu})"))
        .draw()
        .map_err(err)?;
    for s in &p.series {
        let col = colour(&s.topology);
        let w = stroke(s.choice);
        c.draw_series(LineSeries::new(
            s.t.iter().map(|t| t * ts).zip(s.i.iter().map(|i| i * is)),
            col.stroke_width(w),
        ))
        .map_err(err)?
        .label(s.label.as_str())
        .legend(move |(x, y)| PathElement::new([(x, y), (x + 20, y)], col.stroke_width(w)));
    }
    if let Some(i_rel) = p.release_current {
        let y = i_rel * is;
        level(
            &mut c,
            y,
            (t_end, 0.6),
            i_top,
            &format!("release current {} {iu}", sig(y)),
            RGBColor(90, 90, 90),
        )?;
    }
    if let Some(t_rel) = p.release_decay {
        let x = t_rel * ts;
        let grey = RGBColor(90, 90, 90);
        c.draw_series(DashedLineSeries::new(
            [(x, 0.0), (x, i_top)],
            6,
            4,
            grey.stroke_width(1),
        ))
        .map_err(err)?;
        c.draw_series(std::iter::once(Text::new(
            format!("releases at {} {tu} (+ mechanical)", sig(x)),
            (x + t_end * 0.01, i_top * 0.92),
            ("sans-serif", 12),
        )))
        .map_err(err)?;
    }
    c.configure_series_labels()
        .border_style(BLACK)
        .background_style(WHITE)
        .draw()
        .map_err(err)
}

/// The voltage panel, with the rating, the derated limit and the supply drawn and labelled.
fn voltage_panel(area: &Area<'_>, p: &Plot, sc: &Scales) -> Result<(), String> {
    let (ts, tu, t_end) = sc.t;
    let mut c = ChartBuilder::on(area)
        .caption("voltage across the switch", ("sans-serif", 16))
        .margin(10)
        .x_label_area_size(35)
        .y_label_area_size(60)
        .build_cartesian_2d(0f32..t_end, 0f32..sc.v_top)
        .map_err(err)?;
    c.configure_mesh()
        .x_desc(format!("time ({tu})"))
        .y_desc("voltage (V)")
        .draw()
        .map_err(err)?;
    let mut levels = std::vec![
        (p.rating, "switch rating", BLACK),
        (p.limit, "derated limit", RGBColor(120, 120, 120)),
        (p.supply, "supply", RGBColor(160, 160, 160)),
    ];
    if let Some(a) = p.avalanche {
        levels.push((a, "switch avalanche onset", colour("avalanche")));
    }
    // Labels of close levels are staggered along the time axis so none covers another.
    levels.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut x = 0.6f32;
    let mut prev = f32::NEG_INFINITY;
    for (y, words, col) in levels {
        x = if y - prev < sc.v_top * 0.05 {
            if x > 0.3 {
                x - 0.27
            } else {
                0.6
            }
        } else {
            0.6
        };
        prev = y;
        level(
            &mut c,
            y,
            (t_end, x),
            sc.v_top,
            &format!("{words} {y:.1} V"),
            col,
        )?;
    }
    for s in &p.series {
        c.draw_series(LineSeries::new(
            s.t.iter().map(|t| t * ts).zip(s.v.iter().copied()),
            colour(&s.topology).stroke_width(stroke(s.choice)),
        ))
        .map_err(err)?;
    }
    Ok(())
}

/// A chart of the plots: time against one quantity.
type Chart<'a, 'b> = ChartContext<
    'a,
    SVGBackend<'b>,
    Cartesian2d<plotters::coord::types::RangedCoordf32, plotters::coord::types::RangedCoordf32>,
>;

/// A dashed horizontal line at `y` with its label just above it (never on the line), the
/// label starting at `at.1` of the time axis `at.0`.
fn level(
    c: &mut Chart<'_, '_>,
    y: f32,
    at: (f32, f32),
    top: f32,
    words: &str,
    col: RGBColor,
) -> Result<(), String> {
    let (t_end, frac) = at;
    c.draw_series(DashedLineSeries::new(
        [(0.0, y), (t_end, y)],
        6,
        4,
        col.stroke_width(1),
    ))
    .map_err(err)?;
    c.draw_series(std::iter::once(Text::new(
        words.to_string(),
        (t_end * frac, y + top * 0.062),
        ("sans-serif", 12).into_font().color(&col),
    )))
    .map_err(err)?;
    Ok(())
}

/// A number to four significant figures, for the labels.
fn sig(x: f32) -> String {
    let a = x.abs();
    if a >= 100.0 {
        format!("{x:.0}")
    } else if a >= 10.0 {
        format!("{x:.1}")
    } else if a >= 1.0 {
        format!("{x:.2}")
    } else {
        format!("{x:.3}")
    }
}

/// The SVG document of one driver's plot.
///
/// # Errors
/// Non-finite data, or the drawing library's error, as text.
pub fn render(p: &Plot) -> Result<String, String> {
    finite(p)?;
    let sc = scales(p);
    let mut out = String::new();
    {
        let root = SVGBackend::with_string(&mut out, (900, 760)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let (top, body) = root.split_vertically(60);
        head(&top, p)?;
        let (upper, lower) = body.split_vertically(350);
        current_panel(&upper, p, &sc)?;
        voltage_panel(&lower, p, &sc)?;
        root.present().map_err(err)?;
    }
    Ok(out)
}
