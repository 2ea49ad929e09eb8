//! SVG plots of the coil current and the switch voltage after switch-off, one curve per clamp
//! option of a driver (drawn with the `plotters` crate).

use super::report::DriverPlot;
use plotters::prelude::*;
use std::format;
use std::string::{String, ToString};

const COLOURS: [RGBColor; 5] = [
    RGBColor(31, 119, 180),
    RGBColor(214, 39, 40),
    RGBColor(44, 160, 44),
    RGBColor(148, 103, 189),
    RGBColor(255, 127, 14),
];

/// The SVG document of one driver's plots.
///
/// # Errors
/// The drawing library's error, as text.
pub fn svg(plot: &DriverPlot) -> Result<String, String> {
    let mut out = String::new();
    {
        let root = SVGBackend::with_string(&mut out, (900, 700)).into_drawing_area();
        root.fill(&WHITE).map_err(|e| e.to_string())?;
        let (top, bottom) = root.split_vertically(350);
        let t_max = plot
            .series
            .iter()
            .filter_map(|s| s.t_ms.last().copied())
            .fold(0.0f32, f32::max)
            .max(1e-3);
        let i_max = plot
            .series
            .iter()
            .flat_map(|s| s.i_a.iter().copied())
            .fold(0.0f32, f32::max)
            .max(1e-6);
        let v_max = plot
            .series
            .iter()
            .flat_map(|s| s.v_switch.iter().copied())
            .fold(0.0f32, f32::max)
            .max(1.0);
        let mut c1 = ChartBuilder::on(&top)
            .caption(
                format!(
                    "{}: coil current after switch-off (engineering estimate)",
                    plot.name
                ),
                ("sans-serif", 18),
            )
            .margin(10)
            .x_label_area_size(35)
            .y_label_area_size(60)
            .build_cartesian_2d(0f32..t_max, 0f32..i_max * 1.05)
            .map_err(|e| e.to_string())?;
        c1.configure_mesh()
            .x_desc("time (ms)")
            .y_desc("current (A)")
            .draw()
            .map_err(|e| e.to_string())?;
        for (k, s) in plot.series.iter().enumerate() {
            let col = COLOURS.get(k % COLOURS.len()).copied().unwrap_or(BLACK);
            c1.draw_series(LineSeries::new(
                s.t_ms.iter().copied().zip(s.i_a.iter().copied()),
                col.stroke_width(2),
            ))
            .map_err(|e| e.to_string())?
            .label(s.label.as_str())
            .legend(move |(x, y)| PathElement::new([(x, y), (x + 20, y)], col.stroke_width(2)));
        }
        c1.configure_series_labels()
            .border_style(BLACK)
            .background_style(WHITE)
            .draw()
            .map_err(|e| e.to_string())?;
        let mut c2 = ChartBuilder::on(&bottom)
            .caption("switch voltage (drain to ground)", ("sans-serif", 18))
            .margin(10)
            .x_label_area_size(35)
            .y_label_area_size(60)
            .build_cartesian_2d(0f32..t_max, 0f32..v_max * 1.1)
            .map_err(|e| e.to_string())?;
        c2.configure_mesh()
            .x_desc("time (ms)")
            .y_desc("voltage (V)")
            .draw()
            .map_err(|e| e.to_string())?;
        for (k, s) in plot.series.iter().enumerate() {
            let col = COLOURS.get(k % COLOURS.len()).copied().unwrap_or(BLACK);
            c2.draw_series(LineSeries::new(
                s.t_ms.iter().copied().zip(s.v_switch.iter().copied()),
                col.stroke_width(2),
            ))
            .map_err(|e| e.to_string())?;
        }
        root.present().map_err(|e| e.to_string())?;
    }
    Ok(out)
}
