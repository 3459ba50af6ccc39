//! The motor rating line on the power chart when the design names no motor:
//! the next standard rating above the peak corner, from the engine's IEC
//! 60072-1 kW and NEMA MG 1 hp series (`kneepoint_engine::motor`).

use kneepoint_engine::motor::{ratings, MotorSeries};
use kneepoint_engine::UnitSystem;

/// The smallest standard rating (W) at or above `peak_w`: IEC kW in metric,
/// NEMA hp in US units. `None` above the largest listed, or for a peak that
/// is not a positive number.
pub fn next_standard_rating(peak_w: f64, units: UnitSystem) -> Option<f64> {
    if !(peak_w.is_finite() && peak_w > 0.0) {
        return None;
    }
    let series = match units {
        UnitSystem::Metric => MotorSeries::Iec,
        UnitSystem::Us => MotorSeries::Nema,
    };
    ratings(series)
        .into_iter()
        .map(|r| r.rating_w)
        // Slack so 7.5 kW computed as 7499.9999 W gives 7.5.
        .find(|&w| w >= peak_w * (1.0 - 1e-9))
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::units::HORSEPOWER;

    #[test]
    fn next_rating_table() {
        // (peak W, units, rating W); series values from IEC 60072-1 and
        // NEMA MG 1 (from memory, as in the engine).
        let table = [
            (6_900.0, UnitSystem::Metric, Some(7_500.0)),
            (7_500.0, UnitSystem::Metric, Some(7_500.0)),
            (7_501.0, UnitSystem::Metric, Some(11_000.0)),
            (50.0, UnitSystem::Metric, Some(60.0)),
            (6_900.0, UnitSystem::Us, Some(10.0 * HORSEPOWER)),
            (3.0 * HORSEPOWER, UnitSystem::Us, Some(3.0 * HORSEPOWER)),
            (2_000_000.0, UnitSystem::Metric, None),
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
}
