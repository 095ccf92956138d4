//! Lines for drawing, thinned to what a screen can show: in each column of
//! the view the lowest and the highest point, so a spike or a dip stays
//! visible. For drawing only: never compute with the result.

/// The points of `items` (in station order) between stations `range`, at
/// most about two per column when `columns` columns span the range: in each
/// column the lowest and the highest `value`, in station order. A line
/// short enough is returned whole. One point beyond each end of the range
/// is kept so the line reaches the edges. An unbounded range (a view not
/// yet laid out) is the line's own extent.
pub fn lowest_and_highest<T>(
    items: &[T],
    station: impl Fn(&T) -> f64,
    value: impl Fn(&T) -> f64,
    range: (f64, f64),
    columns: usize,
) -> Vec<[f64; 2]> {
    let range = match (items.first(), items.last()) {
        (Some(a), Some(b)) if !(range.0.is_finite() && range.1.is_finite()) => (
            if range.0.is_finite() { range.0 } else { station(a) },
            if range.1.is_finite() { range.1 } else { station(b) },
        ),
        _ => range,
    };
    let lo = items.partition_point(|p| station(p) < range.0).saturating_sub(1);
    let hi = (items.partition_point(|p| station(p) <= range.1) + 1).min(items.len());
    let Some(points) = items.get(lo..hi) else { return Vec::new() };
    let columns = columns.max(1);
    if points.len() <= 2 * columns {
        return points.iter().map(|p| [station(p), value(p)]).collect();
    }
    thin(points.iter().map(|p| [station(p), value(p)]), range, columns)
}

/// One column's lowest and highest point so far (with their places in the
/// line), and which came first.
#[derive(Clone, Copy)]
struct Run {
    low: (usize, [f64; 2]),
    high: (usize, [f64; 2]),
    low_first: bool,
}

/// Thins points pushed in station order for drawing between stations
/// `range` (finite): keeps the last point before the range, in each of
/// `columns` columns across it the lowest and the highest value (in station
/// order), and the first point past it.
pub struct Thinner {
    range: (f64, f64),
    width: f64,
    column: i64,
    /// Where the current column ends.
    edge: f64,
    run: Option<Run>,
    before: Option<[f64; 2]>,
    count: usize,
    done: bool,
    out: Vec<[f64; 2]>,
}

impl Thinner {
    /// A thinner for `columns` columns across `range`.
    pub fn new(range: (f64, f64), columns: usize) -> Self {
        let columns = columns.max(1);
        #[allow(clippy::cast_precision_loss)]
        let width = (range.1 - range.0) / columns as f64;
        Self {
            range,
            width,
            column: -1,
            edge: f64::NEG_INFINITY,
            run: None,
            before: None,
            count: 0,
            done: false,
            out: Vec::with_capacity(2 * columns + 8),
        }
    }

    /// Whether the first point past the range has been seen (nothing more
    /// is wanted).
    pub fn done(&self) -> bool {
        self.done
    }

    fn flush(&mut self) {
        if let Some(r) = self.run.take() {
            let (a, b) = if r.low_first { (r.low, r.high) } else { (r.high, r.low) };
            self.out.push(a.1);
            if a.0 != b.0 {
                self.out.push(b.1);
            }
        }
    }

    /// Takes the next point `[station, value]`.
    #[inline]
    pub fn push(&mut self, p: [f64; 2]) {
        if self.done {
            return;
        }
        let k = self.count;
        self.count += 1;
        if p[0] < self.range.0 {
            self.before = Some(p);
            return;
        }
        if let Some(b) = self.before.take() {
            self.out.push(b);
        }
        if p[0] > self.range.1 {
            self.flush();
            self.out.push(p);
            self.done = true;
            return;
        }
        if p[0] >= self.edge {
            // A new column (found by division only when the column changes).
            #[allow(clippy::cast_possible_truncation, clippy::cast_precision_loss)]
            let column = if self.width > 0.0 && self.width.is_finite() {
                ((p[0] - self.range.0) / self.width).floor() as i64
            } else {
                0
            };
            if column != self.column || self.run.is_none() {
                self.flush();
                self.column = column;
                #[allow(clippy::cast_precision_loss)]
                let edge = self.range.0 + (column + 1) as f64 * self.width;
                self.edge = if self.width > 0.0 && self.width.is_finite() { edge } else { f64::INFINITY };
                self.run = Some(Run { low: (k, p), high: (k, p), low_first: true });
                return;
            }
        }
        if let Some(r) = &mut self.run {
            if p[1] < r.low.1[1] {
                r.low = (k, p);
                r.low_first = false;
            }
            if p[1] > r.high.1[1] {
                r.high = (k, p);
                r.low_first = true;
            }
        }
    }

    /// The thinned line.
    pub fn finish(mut self) -> Vec<[f64; 2]> {
        if let Some(b) = self.before.take() {
            self.out.push(b);
        }
        self.flush();
        self.out
    }
}

/// Points `[station, value]` given in station order thinned by a
/// [`Thinner`]; the points may start anywhere before the range, and those
/// past the first beyond it are not read.
pub fn thin(points: impl Iterator<Item = [f64; 2]>, range: (f64, f64), columns: usize) -> Vec<[f64; 2]> {
    let mut thinner = Thinner::new(range, columns);
    for p in points {
        thinner.push(p);
        if thinner.done() {
            break;
        }
    }
    thinner.finish()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_spike_and_a_dip_survey_the_thinning() {
        // 10 001 points 0.1 m apart, flat at 0 but for a spike at 300 m and a
        // dip at 700 m; 100 columns over 0–1000 m.
        let line: Vec<(f64, f64)> = (0..=10_000)
            .map(|i| {
                let s = f64::from(i) * 0.1;
                let v = if i == 3000 {
                    7.5
                } else if i == 7000 {
                    -4.0
                } else {
                    0.0
                };
                (s, v)
            })
            .collect();
        for range in [(0.0, 1000.0), (f64::NEG_INFINITY, f64::INFINITY)] {
            let out = lowest_and_highest(&line, |p| p.0, |p| p.1, range, 100);
            assert!(out.len() <= 2 * 100 + 2, "{}", out.len());
            assert!(
                out.iter().any(|p| p[1].to_bits() == 7.5_f64.to_bits())
                    && out.iter().any(|p| p[1].to_bits() == (-4.0_f64).to_bits()),
                "{range:?}"
            );
            assert!(out.windows(2).all(|w| w[0][0] < w[1][0]), "in station order");
        }
        // A short line comes back whole.
        assert_eq!(lowest_and_highest(&line[..50], |p| p.0, |p| p.1, (0.0, 1000.0), 100).len(), 50);
    }
}
