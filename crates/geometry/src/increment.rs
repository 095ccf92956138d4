//! A design increment (5 m, 10 ft, 0.1 m): the lengths a designer writes
//! are its exact multiples, and read as typed (118.8, never
//! 118.80000000000001).

use crate::tolerance::ROUNDING_HAIR;

/// The most decimals an increment is taken to (a micrometre, a millionth of
/// a foot).
const MAX_DECIMALS: usize = 6;

/// A step lengths are rounded to, with the decimals it is written to.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Increment {
    step: f64,
    decimals: usize,
}

impl Increment {
    /// The increment `step` (1 when it is not a positive number).
    pub fn new(step: f64) -> Self {
        let step = if step.is_finite() && step > 0.0 { step } else { 1.0 };
        let decimals = (0..=MAX_DECIMALS)
            .find(|&d| {
                let scaled = step * 10f64.powi(i32::try_from(d).unwrap_or(0));
                (scaled - scaled.round()).abs() <= ROUNDING_HAIR * scaled.max(1.0)
            })
            .unwrap_or(MAX_DECIMALS);
        Self { step, decimals }
    }

    /// The step.
    pub fn step(self) -> f64 {
        self.step
    }

    /// How many decimals the step is written to (5 → 0, 2.5 → 1, 0.25 → 2).
    pub fn decimals(self) -> usize {
        self.decimals
    }

    /// `value` to the increment's decimals: the number as it is written.
    fn exact(self, value: f64) -> f64 {
        let scale = 10f64.powi(i32::try_from(self.decimals).unwrap_or(0));
        (value * scale).round() / scale
    }

    /// The smallest multiple at or above `value` (an exact multiple, within
    /// [`ROUNDING_HAIR`] of a step, stays put).
    pub fn up(self, value: f64) -> f64 {
        self.exact((value / self.step - ROUNDING_HAIR).ceil() * self.step)
    }

    /// The largest multiple at or below `value` (an exact multiple stays).
    pub fn down(self, value: f64) -> f64 {
        self.exact((value / self.step + ROUNDING_HAIR).floor() * self.step)
    }

    /// The multiple after `value` (a multiple).
    pub fn after(self, value: f64) -> f64 {
        self.exact(((value / self.step).round() + 1.0) * self.step)
    }

    /// `value` written to the increment's decimals.
    pub fn text(self, value: f64) -> String {
        format!("{value:.*}", self.decimals)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn multiples_are_the_numbers_as_typed() {
        let tenth = Increment::new(0.1);
        assert_eq!(tenth.decimals(), 1);
        // 1188 × 0.1 is 118.80000000000001 in binary arithmetic.
        assert_eq!(tenth.up(118.75).to_bits(), 118.8f64.to_bits());
        let mut length = tenth.up(118.0);
        for _ in 0..8 {
            length = tenth.after(length);
        }
        assert_eq!(length.to_bits(), 118.8f64.to_bits());
        assert_eq!(tenth.text(length), "118.8");
        let five = Increment::new(5.0);
        assert_eq!(
            (five.decimals(), five.up(185.0), five.up(184.2), five.down(119.86)),
            (0, 185.0, 185.0, 115.0)
        );
        assert_eq!(five.text(120.0), "120");
        assert_eq!(Increment::new(2.5).decimals(), 1);
        assert_eq!(Increment::new(0.25).decimals(), 2);
        assert_eq!(Increment::new(-3.0).step().to_bits(), 1.0f64.to_bits());
    }
}
