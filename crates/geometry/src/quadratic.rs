//! The real roots of a quadratic c0 + c1·t + c2·t², found the numerically
//! stable way: q = −(c1 + sign(c1)·√(c1² − 4·c2·c0))/2, roots q/c2 and
//! c0/q, so neither root is the difference of two nearly equal numbers
//! (W. H. Press et al., *Numerical Recipes*, 3rd ed., §5.6, eq. 5.6.4 and
//! 5.6.5, from memory). Shared by the sight-distance walk and the crossings
//! of the profile with the ground.

use crate::tolerance::QUADRATIC_FLAT;

/// The real roots of c0 + c1·t + c2·t² (c2 ≠ 0), ascending; `None` when
/// there are none. When q = 0 (c0 = c1 = 0) the one root 0 comes first and
/// the second is NaN.
pub fn roots(c0: f64, c1: f64, c2: f64) -> Option<[f64; 2]> {
    let disc = c1 * c1 - 4.0 * c2 * c0;
    if disc < 0.0 {
        return None;
    }
    let q = -0.5 * (c1 + c1.signum() * disc.sqrt());
    let mut found = if q == 0.0 { [0.0, f64::NAN] } else { [q / c2, c0 / q] };
    if found[0] > found[1] {
        found.swap(0, 1);
    }
    Some(found)
}

/// The real roots of c0 + c1·t + c2·t² looked for on [0, `reach`]:
/// [`roots`], except that where the square term stays negligible over the
/// interval (|c2|·reach² at most [`QUADRATIC_FLAT`] of the terms' sizes) it
/// is solved as the straight line it is (one root, the second NaN; none
/// when the line is level).
pub fn roots_within(c0: f64, c1: f64, c2: f64, reach: f64) -> Option<[f64; 2]> {
    let scale = c0.abs() + (c1 * reach).abs() + (c2 * reach * reach).abs();
    if c2.abs() * reach * reach <= QUADRATIC_FLAT * scale.max(f64::MIN_POSITIVE) {
        return Some([if c1 == 0.0 { f64::NAN } else { -c0 / c1 }, f64::NAN]);
    }
    roots(c0, c1, c2)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn roots_of_known_quadratics() {
        // (t − 2)(t − 3) = 6 − 5t + t²
        assert_eq!(roots(6.0, -5.0, 1.0), Some([2.0, 3.0]));
        // −2(t + 1)(t − 4) = 8 + 6t − 2t²: ascending whatever the sign of c2.
        assert_eq!(roots(8.0, 6.0, -2.0), Some([-1.0, 4.0]));
        assert_eq!(roots(1.0, 0.0, 1.0), None);
        let [zero, none] = roots(0.0, 0.0, 3.0).unwrap_or([f64::NAN; 2]);
        assert!(zero == 0.0 && none.is_nan());
    }

    #[test]
    fn a_small_root_keeps_its_digits() {
        // t² − 1e8·t + 1 = 0: roots 1e-8 and 1e8; the naive formula loses
        // the small one entirely.
        let [small, large] = roots(1.0, -1e8, 1.0).unwrap_or([f64::NAN; 2]);
        assert!((small - 1e-8).abs() < 1e-22, "{small}");
        assert!((large - 1e8).abs() < 1e-6, "{large}");
    }

    #[test]
    fn a_negligible_square_term_is_a_line() {
        let [root, none] = roots_within(-2.0, 1.0, 1e-20, 10.0).unwrap_or([f64::NAN; 2]);
        assert!((root - 2.0).abs() < 1e-15 && none.is_nan());
        let [root, _] = roots_within(5.0, 0.0, 0.0, 10.0).unwrap_or([0.0; 2]);
        assert!(root.is_nan(), "a level line has no root");
        assert_eq!(roots_within(6.0, -5.0, 1.0, 10.0), Some([2.0, 3.0]));
    }
}
