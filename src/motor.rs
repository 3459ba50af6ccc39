//! Standard motor ratings, for the rating line on the power chart when the
//! design names no motor. (Candidate for the engine; kept here until the
//! duty-cycle work settles motor sizing there.)

use kneepoint_engine::units::HORSEPOWER;
use kneepoint_engine::UnitSystem;

/// IEC output ratings (kW) of general-purpose motors, the usual series of
/// IEC 60072-1 frame assignments (from memory, not re-read).
pub const IEC_KW: &[f64] = &[
    0.06, 0.09, 0.12, 0.18, 0.25, 0.37, 0.55, 0.75, 1.1, 1.5, 2.2, 3.0, 4.0, 5.5, 7.5,
    11.0, 15.0, 18.5, 22.0, 30.0, 37.0, 45.0, 55.0, 75.0, 90.0, 110.0, 132.0, 160.0,
    200.0, 250.0, 315.0, 355.0, 400.0, 450.0, 500.0,
];

/// NEMA MG 1 horsepower ratings of integral and fractional motors
/// (from memory, not re-read).
pub const NEMA_HP: &[f64] = &[
    0.25, 0.33, 0.5, 0.75, 1.0, 1.5, 2.0, 3.0, 5.0, 7.5, 10.0, 15.0, 20.0, 25.0, 30.0,
    40.0, 50.0, 60.0, 75.0, 100.0, 125.0, 150.0, 200.0, 250.0, 300.0, 350.0, 400.0,
    450.0, 500.0,
];

/// The smallest standard rating (W) at or above `peak_w`: IEC kW in metric,
/// NEMA hp in US units. `None` above the largest listed, or for a peak that
/// is not a positive number.
pub fn next_standard_rating(peak_w: f64, units: UnitSystem) -> Option<f64> {
    if !(peak_w.is_finite() && peak_w > 0.0) {
        return None;
    }
    let (list, scale) = match units {
        UnitSystem::Metric => (IEC_KW, 1000.0),
        UnitSystem::Us => (NEMA_HP, HORSEPOWER),
    };
    list.iter()
        .map(|r| r * scale)
        // A thousandth of slack so 7.5 kW computed as 7499.9999 W gives 7.5.
        .find(|&w| w >= peak_w * (1.0 - 1e-9))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn next_rating_table() {
        // (peak W, units, rating W)
        let table = [
            (6_900.0, UnitSystem::Metric, Some(7_500.0)),
            (7_500.0, UnitSystem::Metric, Some(7_500.0)),
            (7_501.0, UnitSystem::Metric, Some(11_000.0)),
            (50.0, UnitSystem::Metric, Some(60.0)),
            (6_900.0, UnitSystem::Us, Some(10.0 * HORSEPOWER)),
            (3.0 * HORSEPOWER, UnitSystem::Us, Some(3.0 * HORSEPOWER)),
            (600_000.0, UnitSystem::Metric, None),
            (0.0, UnitSystem::Metric, None),
            (f64::NAN, UnitSystem::Us, None),
        ];
        for (peak, units, want) in table {
            let got = next_standard_rating(peak, units);
            match (got, want) {
                (Some(g), Some(w)) => {
                    assert!((g - w).abs() < 1e-6, "{peak} {units:?}: {g}")
                }
                _ => assert_eq!(got, want, "{peak} {units:?}"),
            }
        }
    }

    #[test]
    fn series_rise() {
        for l in [IEC_KW, NEMA_HP] {
            assert!(l.windows(2).all(|w| w[0] < w[1]));
        }
    }
}
