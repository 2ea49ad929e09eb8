//! SVG plots (drawn with the `plotters` crate): the coil current and the voltage across the
//! switch after switch-off, one trace per clamp option, each option in its own colour in
//! every plot, one legend, the switch's rating and derated limit drawn, and the corner named.

use crate::host::report::plot::{Choice, Plot};
use plotters::prelude::*;
use std::format;
use std::string::{String, ToString};

/// The colour of an option, the same in every plot.
fn colour(c: Choice) -> RGBColor {
    match c {
        Choice::Designed => RGBColor(31, 119, 180),
        Choice::Diode => RGBColor(44, 160, 44),
        Choice::ResistorDiode => RGBColor(255, 127, 14),
        Choice::Avalanche => RGBColor(214, 39, 40),
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

/// Refuses data a plot cannot show (the analysis never makes it: a guard).
fn finite(p: &Plot) -> Result<(), String> {
    let ok = p
        .series
        .iter()
        .all(|s| s.t.iter().chain(&s.i).chain(&s.v).all(|x| x.is_finite()));
    if ok && p.rating.is_finite() && p.limit.is_finite() {
        Ok(())
    } else {
        Err(format!("plot of {}: non-finite data", p.name))
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
        .fold(p.rating, f32::max);
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
    let title = format!("{}: switch-off at the worst switch-voltage corner (an engineering estimate: verify on hardware)", p.name);
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
        let col = colour(s.choice);
        c.draw_series(LineSeries::new(
            s.t.iter().map(|t| t * ts).zip(s.i.iter().map(|i| i * is)),
            col.stroke_width(2),
        ))
        .map_err(err)?
        .label(s.label.as_str())
        .legend(move |(x, y)| PathElement::new([(x, y), (x + 20, y)], col.stroke_width(2)));
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
    for (level, words, col) in [
        (p.rating, "switch rating", BLACK),
        (p.limit, "derated limit", RGBColor(120, 120, 120)),
        (p.supply, "supply", RGBColor(160, 160, 160)),
    ] {
        c.draw_series(DashedLineSeries::new(
            [(0.0, level), (t_end, level)],
            6,
            4,
            col.stroke_width(1),
        ))
        .map_err(err)?;
        c.draw_series(std::iter::once(Text::new(
            format!("{words} {level:.1} V"),
            (t_end * 0.72, level),
            ("sans-serif", 12),
        )))
        .map_err(err)?;
    }
    for s in &p.series {
        c.draw_series(LineSeries::new(
            s.t.iter().map(|t| t * ts).zip(s.v.iter().copied()),
            colour(s.choice).stroke_width(2),
        ))
        .map_err(err)?;
    }
    Ok(())
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
