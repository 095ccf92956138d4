//! The blocks around the profile: the bands under it, the sight-distance
//! band, the match lines, the findings, the title block and the cautions.

use gradewright_geometry::{Analysis, Severity, Station};

use super::compose::Page;
use super::tree::{Element, mm};
use super::{
    ACCENT, AXIS_LABELS, BAND_ROW, BOTTOM_BLOCK, CAUTION, Layout, MARGIN, SIGHT_BAND, SMALL, SheetOptions,
    TEXT,
};

/// A box on the sheet.
fn frame_rect(
    x: impl ToString,
    y: impl ToString,
    w: impl ToString,
    h: impl ToString,
    stroke: f64,
) -> Element {
    Element::new("rect")
        .a("x", x)
        .a("y", y)
        .a("width", w)
        .a("height", h)
        .a("fill", "none")
        .a("stroke", "#000")
        .a("stroke-width", stroke)
}

/// The bands at each major station: the proposed elevation, and with
/// ground the existing elevation and the cut or fill depth. Also says how
/// many rows there are.
pub(super) fn bands(analysis: &Analysis, page: &Page) -> (Vec<Element>, usize) {
    let (fx, fy, fw, fh) = page.frame;
    let band_y = fy + fh + AXIS_LABELS;
    let with_ground = analysis.ground.range().is_some();
    let rows: &[(&str, &str)] = if with_ground {
        &[("Proposed", "elevation"), ("Existing", "ground"), ("Cut C /", "fill F")]
    } else {
        &[("Proposed", "elevation")]
    };
    let mut out = Vec::new();
    for (k, (first, second)) in rows.iter().enumerate() {
        #[allow(clippy::cast_precision_loss)]
        let y0 = band_y + k as f64 * BAND_ROW;
        out.push(frame_rect(fx, y0, fw, BAND_ROW, 0.3));
        for (line, text) in [(0.0, first), (2.6, second)] {
            out.push(
                Element::text(*text)
                    .a("x", mm(fx - 1.5))
                    .a("y", mm(y0 + BAND_ROW / 2.0 + line))
                    .a("font-size", SMALL)
                    .a("text-anchor", "end"),
            );
        }
    }
    if let Some(alignment) = analysis.alignment.as_ref() {
        for s in page.major_stations(analysis.profile.stationing()) {
            let Ok(sample) = alignment.sample(Station(s)) else { continue };
            let ground = analysis.ground.elevation_at(s);
            let cells = [
                ("BandElevation", Some(format!("{:.3}", sample.elevation))),
                ("BandGround", ground.map(|g| format!("{g:.3}"))),
                (
                    "BandCutFill",
                    ground.map(|g| {
                        let d = g - sample.elevation;
                        if d > 0.0 { format!("C {d:.3}") } else { format!("F {:.3}", (-d).max(0.0)) }
                    }),
                ),
            ];
            for (k, (class, text)) in cells.into_iter().take(rows.len()).enumerate() {
                let Some(text) = text else { continue };
                #[allow(clippy::cast_precision_loss)]
                let (x, y) = (mm(page.x(s) + 0.8), mm(band_y + (k as f64 + 1.0) * BAND_ROW - 1.5));
                out.push(
                    Element::text(text)
                        .a("class", class)
                        .a("x", &x)
                        .a("y", &y)
                        .a("font-size", SMALL)
                        .a("transform", format!("rotate(-90 {x} {y})")),
                );
            }
        }
    }
    (out, rows.len())
}

/// The sight-distance band under `rows` bands: available forward and
/// backward, and the requirement, up to the cap.
pub(super) fn sight_band(analysis: &Analysis, page: &Page, rows: usize) -> Vec<Element> {
    let Some(sight) = analysis.sight.as_deref() else { return Vec::new() };
    let (fx, fy, fw, fh) = page.frame;
    let range = page.range;
    #[allow(clippy::cast_precision_loss)]
    let top = fy + fh + AXIS_LABELS + rows as f64 * BAND_ROW + 2.0;
    let height = SIGHT_BAND - 4.0;
    let cap = sight.cap.max(1.0);
    let sy = |d: f64| top + height - d.min(cap) / cap * height;
    let len = analysis.profile.units.length_symbol();
    let pick = |f: &dyn Fn(&gradewright_geometry::visibility::SightSample) -> f64| {
        let mut d = String::new();
        let stride = (sight.samples.len() / 4000).max(1);
        let within = sight.samples.iter().filter(|s| s.station >= range.0 && s.station <= range.1);
        for (k, sample) in within.step_by(stride).enumerate() {
            d.push_str(&format!(
                "{}{},{} ",
                if k == 0 { "M" } else { "L" },
                mm(page.x(sample.station)),
                mm(sy(f(sample)))
            ));
        }
        d
    };
    let label = |text: String, y: f64| {
        Element::text(text).a("x", mm(fx - 1.5)).a("y", mm(y)).a("font-size", SMALL).a("text-anchor", "end")
    };
    let curve = |class: &'static str, d: String, stroke: &'static str, width: f64| {
        Element::new("path")
            .a("class", class)
            .a("d", d)
            .a("fill", "none")
            .a("stroke", stroke)
            .a("stroke-width", width)
    };
    vec![
        frame_rect(fx, top, fw, height, 0.3),
        label(format!("Sight ({len})"), top + height / 2.0),
        label(format!("cap {cap:.0}"), top + 2.0),
        curve("AvailableForward", pick(&|s| s.forward), "#000", 0.25),
        curve("AvailableBackward", pick(&|s| s.backward), "#777", 0.25).a("stroke-dasharray", "1 0.6"),
        curve("Required", pick(&|s| s.required_forward.max(s.required_backward)), ACCENT, 0.3),
    ]
}

/// Match lines where the profile continues on another sheet.
pub(super) fn match_lines(analysis: &Analysis, page: &Page) -> Vec<Element> {
    let (_, fy, _, fh) = page.frame;
    let (range, (number, count)) = (page.range, page.number);
    let end = analysis.alignment.as_ref().map_or(range.1, |a| a.end().0);
    let start = analysis.alignment.as_ref().map_or(range.0, |a| a.start().0);
    let mut out = Vec::new();
    for (at, continues) in [(range.0, number > 1 && range.0 > start), (range.1.min(end), number < count)] {
        if !continues {
            continue;
        }
        let x = mm(page.x(at));
        out.push(
            Element::new("line")
                .a("x1", &x)
                .a("y1", fy)
                .a("x2", &x)
                .a("y2", mm(fy + fh))
                .a("stroke", "#000")
                .a("stroke-width", 0.5)
                .a("stroke-dasharray", "4 1 1 1"),
        );
        out.push(
            Element::text(format!("MATCH LINE {}", analysis.profile.stationing().label_std(at)))
                .a("x", &x)
                .a("y", mm(fy - 1.5))
                .a("font-size", SMALL)
                .a("text-anchor", "middle")
                .a("font-weight", "bold"),
        );
    }
    out
}

/// Where the findings list and the title block sit: the block's top, the
/// title block's left and width, and the list's width.
fn bottom_block((w, h): (f64, f64)) -> (f64, f64, f64, f64) {
    let block_y = h - MARGIN - BOTTOM_BLOCK + 4.0;
    let title_w = 150.0;
    let title_x = w - MARGIN - title_w;
    (block_y, title_x, title_w, title_x - MARGIN - 4.0)
}

/// The findings list (failures first, then warnings, by station), and the
/// note of labels left out for lack of room.
pub(super) fn findings(analysis: &Analysis, paper: (f64, f64), page: &Page, dropped: usize) -> Vec<Element> {
    let (block_y, _, _, list_w) = bottom_block(paper);
    let (fx, fy, fw, _) = page.frame;
    let mut out = vec![frame_rect(MARGIN, block_y, list_w, mm(BOTTOM_BLOCK - 8.0), 0.3)];
    let mut findings: Vec<_> =
        analysis.report.findings.iter().filter(|f| f.severity() != Severity::Info).collect();
    findings
        .sort_by(|a, b| b.severity().cmp(&a.severity()).then(a.station_start.total_cmp(&b.station_start)));
    let fails = findings.iter().filter(|f| f.fails()).count();
    // A sheet whose checks did not run says so where the count would be: a
    // count of no failures would read as a pass.
    let (heading, colour) = match &analysis.criteria {
        Err(why) => (format!("NOT CHECKED: {why}; no curve, grade or sight check has run"), ACCENT),
        Ok(_) => (format!("Findings: {fails} fail, {} warn", findings.len() - fails), "#000"),
    };
    out.push(
        Element::text(heading)
            .a("class", "FindingsHeading")
            .a("x", mm(MARGIN + 2.0))
            .a("y", mm(block_y + 4.0))
            .a("font-size", TEXT)
            .a("font-weight", "bold")
            .a("fill", colour),
    );
    let rows = 9;
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let chars = (list_w / (SMALL * 0.5)) as usize;
    #[allow(clippy::cast_precision_loss)]
    let row_y = |k: usize| mm(block_y + 8.0 + k as f64 * 2.9);
    for (k, f) in findings.iter().take(rows).enumerate() {
        let (mark, colour) = if f.fails() { ("× FAIL", ACCENT) } else { ("! warn", "#000") };
        let mut line = format!("{mark}  {}  {}", f.code, f.message);
        if line.chars().count() > chars {
            line = line.chars().take(chars.saturating_sub(1)).collect::<String>() + "…";
        }
        out.push(
            Element::text(line)
                .a("class", "Finding")
                .a("x", mm(MARGIN + 2.0))
                .a("y", row_y(k))
                .a("font-size", SMALL)
                .a("fill", colour),
        );
    }
    if findings.len() > rows {
        out.push(
            Element::text(format!("… and {} more (see findings.csv)", findings.len() - rows))
                .a("x", mm(MARGIN + 2.0))
                .a("y", row_y(rows))
                .a("font-size", SMALL),
        );
    }
    if let Some(Ok(e)) = &analysis.earthwork {
        let units = analysis.profile.units;
        let at = analysis.profile.stationing();
        let (vol, label) = (gradewright_geometry::volume_symbol(units), |s: f64| at.label_std(s));
        out.push(
            Element::text(format!(
                "Earthwork (level section) from {} to {}, where the ground covers the profile: cut {:.0} {vol}, \
                 fill {:.0} {vol}, net {:+.0} {vol}",
                label(e.range.0),
                label(e.range.1),
                e.cut,
                e.fill,
                e.net()
            ))
            .a("class", "Earthwork")
            .a("x", mm(MARGIN + 2.0))
            .a("y", mm(block_y + BOTTOM_BLOCK - 9.0))
            .a("font-size", SMALL),
        );
    }
    if dropped > 0 {
        out.push(
            Element::text(format!("{dropped} label(s) left out for lack of room; see the tables"))
                .a("class", "DroppedNote")
                .a("x", mm(fx + fw))
                .a("y", mm(fy - 1.5))
                .a("font-size", SMALL)
                .a("text-anchor", "end"),
        );
    }
    out
}

/// The title block: a grid of our own.
pub(super) fn title_block(
    analysis: &Analysis,
    options: &SheetOptions,
    layout: &Layout,
    paper: (f64, f64),
    (number, count): (usize, usize),
) -> Vec<Element> {
    let (block_y, title_x, title_w, _) = bottom_block(paper);
    let t = &options.title;
    let rows: [(&str, String); 8] = [
        ("Project", t.project.clone()),
        ("Road / section", t.road.clone()),
        ("Designed", t.designer.clone()),
        ("Checked", t.checker.clone()),
        ("Date", t.date.clone()),
        ("Scales", format!("H {}   V {}", layout.scale_text.0, layout.scale_text.1)),
        ("Units", analysis.profile.units.to_string()),
        (
            "Sheet",
            format!("{number} of {count}   Rev. {}", if t.revision.is_empty() { "—" } else { &t.revision }),
        ),
    ];
    let tb_h = BOTTOM_BLOCK - 8.0;
    let mut out = vec![frame_rect(mm(title_x), mm(block_y), title_w, tb_h, 0.5)];
    #[allow(clippy::cast_precision_loss)]
    let row_h = tb_h / rows.len() as f64;
    // Each value fits its box: cut with "…" where it would run out of it.
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let room = ((title_w - 31.0) / (TEXT * 0.55)).max(8.0) as usize;
    for (k, (name, value)) in rows.into_iter().enumerate() {
        let value = gradewright_geometry::visible(&value, room);
        #[allow(clippy::cast_precision_loss)]
        let y = block_y + k as f64 * row_h;
        if k > 0 {
            out.push(
                Element::new("line")
                    .a("x1", mm(title_x))
                    .a("y1", mm(y))
                    .a("x2", mm(title_x + title_w))
                    .a("y2", mm(y))
                    .a("stroke", "#000")
                    .a("stroke-width", 0.15),
            );
        }
        out.push(
            Element::text(name)
                .a("x", mm(title_x + 1.5))
                .a("y", mm(y + row_h * 0.7))
                .a("font-size", SMALL)
                .a("fill", "#555"),
        );
        out.push(
            Element::text(value)
                .a("class", "TitleField")
                .a("x", mm(title_x + 30.0))
                .a("y", mm(y + row_h * 0.72))
                .a("font-size", TEXT),
        );
    }
    out.push(
        Element::new("line")
            .a("x1", mm(title_x + 28.5))
            .a("y1", mm(block_y))
            .a("x2", mm(title_x + 28.5))
            .a("y2", mm(block_y + tb_h))
            .a("stroke", "#000")
            .a("stroke-width", 0.15),
    );
    out.push(
        Element::text("Gradewright vertical profile")
            .a("x", mm(title_x + title_w))
            .a("y", mm(block_y - 1.0))
            .a("font-size", SMALL)
            .a("fill", "#555")
            .a("text-anchor", "end"),
    );
    out
}

/// The cautions, on every sheet.
pub(super) fn caution(h: f64) -> Element {
    Element::text(format!("CAUTION: {CAUTION}"))
        .a("class", "Caution")
        .a("x", mm(MARGIN))
        .a("y", mm(h - MARGIN - 1.0))
        .a("font-size", TEXT)
        .a("font-weight", "bold")
}
