//! Round axis ticks: steps of 1, 2 or 5 × 10ⁿ, in display units.
//!
//! The "nice numbers" method (steps from the 1–2–5 series) is the usual one
//! for chart axes; see P. S. Heckbert, "Nice numbers for graph labels",
//! Graphics Gems (1990), from memory. Pure, no web crates.

/// An axis from `min` to `max` with ticks every `step` (display units).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Axis {
    /// Lowest value on the axis.
    pub min: f64,
    /// Highest value on the axis.
    pub max: f64,
    /// Distance between ticks.
    pub step: f64,
}

/// The 1–2–5 step that cuts `span` into at most `target` intervals, and
/// more than `target / 2.5`.
pub fn nice_step(span: f64, target: usize) -> f64 {
    let target = target.max(1) as f64;
    if !(span.is_finite() && span > 0.0) {
        return 1.0;
    }
    let raw = span / target;
    let mag = 10f64.powf(raw.log10().floor());
    let r = raw / mag;
    let m = if r <= 1.0 {
        1.0
    } else if r <= 2.0 {
        2.0
    } else if r <= 5.0 {
        5.0
    } else {
        10.0
    };
    m * mag
}

/// An axis that starts at or below `lo` and ends at or above `hi` on round
/// ticks. A zero or invalid span gives the axis 0 to 1.
pub fn nice_axis(lo: f64, hi: f64, target: usize) -> Axis {
    let (lo, hi) = if lo.is_finite() && hi.is_finite() && hi > lo {
        (lo, hi)
    } else if lo.is_finite() && lo > 0.0 {
        (0.0, lo)
    } else {
        (0.0, 1.0)
    };
    let step = nice_step(hi - lo, target);
    let min = (lo / step).floor() * step;
    let mut max = (hi / step).ceil() * step;
    if max <= min {
        max = min + step;
    }
    Axis { min, max, step }
}

impl Axis {
    /// Tick values from `min` to `max`, each rounded to the step so that
    /// labels read 0.3, not 0.30000000000000004.
    pub fn ticks(&self) -> Vec<f64> {
        ticks_within(self.min, self.max, self.step)
    }
}

/// Round ticks of `step` that lie within `lo ..= hi` (a secondary axis that
/// must not change the primary one's range).
pub fn ticks_within(lo: f64, hi: f64, step: f64) -> Vec<f64> {
    if !(lo.is_finite() && hi.is_finite() && step.is_finite() && step > 0.0) || hi < lo {
        return Vec::new();
    }
    let first = (lo / step - 1e-9).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    if last - first > 1000 {
        return Vec::new();
    }
    (first..=last)
        .map(|i| {
            let v = i as f64 * step;
            let dec = crate::fmt::step_decimals(step) as i32;
            let f = 10f64.powi(dec);
            (v * f).round() / f
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn steps_are_one_two_five() {
        // (span, target, step), by hand from the 1–2–5 rule.
        let table = [
            (168.0, 5, 50.0),
            (100.0, 5, 20.0),
            (2436.0, 5, 500.0),
            (32.0, 4, 10.0),
            (1.0, 5, 0.2),
            (0.07, 4, 0.02),
            (7.0, 5, 2.0),
        ];
        for (span, target, step) in table {
            let s = nice_step(span, target);
            assert!((s - step).abs() < 1e-12 * step, "{span}/{target}: {s}");
        }
    }

    #[test]
    fn axis_covers_range_on_round_ticks() {
        let a = nice_axis(0.0, 168.0, 5);
        assert_eq!((a.min, a.max, a.step), (0.0, 200.0, 50.0));
        assert_eq!(a.ticks(), vec![0.0, 50.0, 100.0, 150.0, 200.0]);
        let b = nice_axis(0.0, 0.7, 5);
        assert_eq!(b.ticks(), vec![0.0, 0.2, 0.4, 0.6, 0.8]);
        let c = nice_axis(0.0, 0.0, 5);
        assert_eq!((c.min, c.max), (0.0, 1.0));
        let d = nice_axis(f64::NAN, 3.0, 5);
        assert_eq!((d.min, d.max), (0.0, 1.0));
    }

    #[test]
    fn every_axis_has_few_ticks_and_holds_its_range() {
        let mut x = 1e-4;
        while x < 1e7 {
            for t in [3, 4, 5, 6] {
                let a = nice_axis(0.0, x, t);
                let n = a.ticks().len();
                assert!(a.min <= 0.0 && a.max >= x, "{x} {t}");
                assert!((2..=2 * t + 2).contains(&n), "{x} {t}: {n} ticks");
            }
            x *= 1.37;
        }
    }

    #[test]
    fn ticks_within_stays_inside() {
        assert_eq!(ticks_within(0.0, 0.95, 0.2), vec![0.0, 0.2, 0.4, 0.6, 0.8]);
        assert_eq!(ticks_within(1.0, 0.0, 0.2), Vec::<f64>::new());
        assert!(ticks_within(0.0, 1.0, 0.0).is_empty());
    }
}
