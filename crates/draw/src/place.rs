//! Label placement shared by the sheet and the editor: labels are placed in
//! output coordinates (paper millimetres or screen points, y down), most
//! important first; each tries its own place, then steps away from its point
//! (drawn with a leader line), and is dropped only when nothing fits. The
//! profile line is kept clear too.

use std::collections::HashMap;

use crate::scene::{Label, Side};
use gradewright_geometry::tolerance::LENGTH_FLOOR;

/// A rectangle in output coordinates (y grows downwards).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Rect {
    /// Left.
    pub x0: f64,
    /// Top.
    pub y0: f64,
    /// Right.
    pub x1: f64,
    /// Bottom.
    pub y1: f64,
}

impl Rect {
    /// Whether two rectangles overlap (touching edges do not).
    pub fn hits(&self, o: &Self) -> bool {
        self.x0 < o.x1 && o.x0 < self.x1 && self.y0 < o.y1 && o.y0 < self.y1
    }

    /// Whether `o` lies wholly inside `self`.
    pub fn contains(&self, o: &Self) -> bool {
        o.x0 >= self.x0 && o.x1 <= self.x1 && o.y0 >= self.y0 && o.y1 <= self.y1
    }
}

/// How far labels sit from their point and how they step away.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Spacing {
    /// Gap between the point and the label in its own place.
    pub gap: f64,
    /// Extra gap per step away.
    pub step: f64,
    /// Places tried, the first included.
    pub tries: u32,
    /// Half the height of the band kept clear along the profile line.
    pub line_clearance: f64,
    /// Longest piece a chord of the line is cut into (so the boxes hug it).
    pub piece: f64,
}

/// One label placed.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Placed {
    /// Index into the labels given.
    pub label: usize,
    /// Where its text goes.
    pub rect: Rect,
    /// Its point, in output coordinates.
    pub anchor: [f64; 2],
    /// Whether it stepped away from its point (draw a leader).
    pub leader: bool,
}

/// The outcome of placing labels.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Placement {
    /// Labels placed, most important first.
    pub placed: Vec<Placed>,
    /// Labels with their point in the frame that found no room.
    pub dropped: usize,
}

/// Occupied rectangles on a uniform grid, for fast overlap tests.
struct Taken {
    cell: f64,
    rects: Vec<Rect>,
    grid: HashMap<(i64, i64), Vec<usize>>,
}

impl Taken {
    fn new(cell: f64) -> Self {
        Self { cell: cell.max(LENGTH_FLOOR), rects: Vec::new(), grid: HashMap::new() }
    }

    fn cells(&self, r: &Rect) -> impl Iterator<Item = (i64, i64)> + use<> {
        // Float to cell index: saturating by `as`, and bounded by the frame.
        #[allow(clippy::cast_possible_truncation)]
        let index = |v: f64, cell: f64| (v / cell).floor() as i64;
        let (cx0, cx1) = (index(r.x0, self.cell), index(r.x1, self.cell));
        let (cy0, cy1) = (index(r.y0, self.cell), index(r.y1, self.cell));
        (cx0..=cx1).flat_map(move |cx| (cy0..=cy1).map(move |cy| (cx, cy)))
    }

    fn hits(&self, r: &Rect) -> bool {
        self.cells(r).any(|c| self.grid.get(&c).is_some_and(|v| v.iter().any(|&i| self.rects[i].hits(r))))
    }

    fn add(&mut self, r: Rect) {
        let i = self.rects.len();
        self.rects.push(r);
        for c in self.cells(&r) {
            self.grid.entry(c).or_default().push(i);
        }
    }
}

/// Places `labels` inside `frame`. `sizes` are the labels' sizes (width,
/// height) in output coordinates, one per label; `to_out` maps a profile
/// point (station, elevation) there; `lines` and `blocked` (output
/// coordinates) are kept clear.
pub fn place_labels(
    labels: &[Label],
    sizes: &[[f64; 2]],
    to_out: impl Fn([f64; 2]) -> [f64; 2],
    frame: Rect,
    (lines, blocked): (&[&[[f64; 2]]], &[Rect]),
    spacing: Spacing,
) -> Placement {
    // Cells about the size of a short label: a query looks at a few cells.
    let cell = ((frame.x1 - frame.x0).max(frame.y1 - frame.y0) / 24.0).max(spacing.piece);
    let mut taken = Taken::new(cell);
    for r in blocked {
        taken.add(*r);
    }
    let half = spacing.line_clearance;
    for line in lines {
        for pair in line.windows(2) {
            let [a, b] = pair else { continue };
            let chord =
                Rect { x0: a[0].min(b[0]), y0: a[1].min(b[1]), x1: a[0].max(b[0]), y1: a[1].max(b[1]) };
            if !chord.hits(&frame) && !frame.contains(&chord) {
                continue;
            }
            let pieces = ((b[0] - a[0]).hypot(b[1] - a[1]) / spacing.piece.max(LENGTH_FLOOR))
                .ceil()
                .clamp(1.0, 10_000.0);
            let mut k = 0.0;
            while k < pieces {
                let (t0, t1) = (k / pieces, (k + 1.0) / pieces);
                let (x0, x1) = (a[0] + (b[0] - a[0]) * t0, a[0] + (b[0] - a[0]) * t1);
                let (y0, y1) = (a[1] + (b[1] - a[1]) * t0, a[1] + (b[1] - a[1]) * t1);
                taken.add(Rect {
                    x0: x0.min(x1),
                    y0: y0.min(y1) - half,
                    x1: x0.max(x1),
                    y1: y0.max(y1) + half,
                });
                k += 1.0;
            }
        }
    }
    let mut order: Vec<usize> = (0..labels.len()).collect();
    order.sort_by_key(|&i| labels[i].priority);
    let mut out = Placement::default();
    for i in order {
        let label = &labels[i];
        let [x, y] = to_out(label.at);
        if !(x >= frame.x0 && x <= frame.x1) {
            continue;
        }
        let Some(&[width, height]) = sizes.get(i) else { continue };
        let mut placed = None;
        for step in 0..spacing.tries {
            let gap = spacing.gap + f64::from(step) * spacing.step;
            let top = match label.side {
                Side::Above => y - gap - height,
                Side::Below => y + gap,
            };
            let rect = Rect { x0: x - width / 2.0, y0: top, x1: x + width / 2.0, y1: top + height };
            if frame.contains(&rect) && !taken.hits(&rect) {
                placed = Some((rect, step));
                break;
            }
        }
        let Some((rect, step)) = placed else {
            out.dropped += 1;
            continue;
        };
        taken.add(rect);
        out.placed.push(Placed { label: i, rect, anchor: [x, y], leader: step > 0 });
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scene::Role;

    fn label(at: [f64; 2], priority: u8) -> Label {
        Label { role: Role::PviLabel, at, lines: vec!["PVI".to_owned()], side: Side::Above, priority }
    }

    const SPACING: Spacing = Spacing { gap: 1.0, step: 3.0, tries: 3, line_clearance: 0.5, piece: 2.0 };

    #[test]
    fn labels_step_away_then_drop_the_least_important() {
        let frame = Rect { x0: 0.0, y0: 0.0, x1: 100.0, y1: 20.0 };
        let labels: Vec<Label> = (0..5).map(|k| label([50.0, 15.0], 4 - k)).collect();
        let p = place_labels(&labels, &[[10.0, 2.0]; 5], |a| a, frame, (&[], &[]), SPACING);
        // Three places above the point fit (gap 1, 4, 7 with height 2), in
        // priority order; the two least important labels are dropped.
        assert_eq!(p.placed.len(), 3);
        assert_eq!(p.dropped, 2);
        assert_eq!(p.placed.iter().map(|q| labels[q.label].priority).collect::<Vec<_>>(), vec![0, 1, 2]);
        assert!(!p.placed[0].leader && p.placed[1].leader);
        for (k, a) in p.placed.iter().enumerate() {
            for b in &p.placed[k + 1..] {
                assert!(!a.rect.hits(&b.rect));
            }
        }
    }

    #[test]
    fn the_line_is_kept_clear() {
        let frame = Rect { x0: 0.0, y0: 0.0, x1: 100.0, y1: 40.0 };
        // A line 2 above the point: the label's own place would cross it.
        let line = [[0.0, 13.0], [100.0, 13.0]];
        let p =
            place_labels(&[label([50.0, 15.0], 0)], &[[10.0, 2.0]], |a| a, frame, (&[&line], &[]), SPACING);
        let rect = p.placed[0].rect;
        assert!(rect.y1 <= 13.0 - 0.5 || rect.y0 >= 13.0 + 0.5, "{rect:?}");
        assert!(p.placed[0].leader);
    }

    #[test]
    fn blocked_boxes_are_kept_clear() {
        let frame = Rect { x0: 0.0, y0: 0.0, x1: 100.0, y1: 40.0 };
        let blocked = Rect { x0: 40.0, y0: 10.0, x1: 60.0, y1: 14.0 };
        let p =
            place_labels(&[label([50.0, 15.0], 0)], &[[10.0, 2.0]], |a| a, frame, (&[], &[blocked]), SPACING);
        assert!(!p.placed[0].rect.hits(&blocked));
        assert!(p.placed[0].leader);
    }
}
