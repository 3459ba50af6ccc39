//! Motor sizing for a duty cycle: RMS (thermal) power, peak allowance and
//! the standard rating series (brief §6).
//!
//! # Formula
//! ```text
//! P_rms = √( Σ P_i²·t_i / Σ t_i )            (continuous form: √(∫P² dt / T))
//! choose the smallest rating P_r with
//!     P_r ≥ P_rms·(1 + margin)   and   P_peak ≤ k·P_r
//! ```
//! The RMS method for fluctuating hydraulic duty is the standard one for
//! cycles shorter than about 5 minutes (brief §6, S-21, S-21b). The margin
//! (default 10 %) and the peak allowance k (default 1.5, breakdown torque
//! less a voltage-sag allowance) are common practice, no source. Idle time
//! counts at its idle power because the motor keeps running; a motor that
//! stops between cycles cools less and plain RMS becomes optimistic.

use serde::{Deserialize, Serialize};

use crate::units::HORSEPOWER;

/// Preferred rated outputs of IEC 60072-1, kW (recalled from memory; the
/// 0.37–55 kW values are corroborated by a catalogue, brief §6).
pub const IEC_KW: &[f64] = &[
    0.06, 0.09, 0.12, 0.18, 0.25, 0.37, 0.55, 0.75, 1.1, 1.5, 2.2, 3.0, 4.0, 5.5, 7.5,
    11.0, 15.0, 18.5, 22.0, 30.0, 37.0, 45.0, 55.0, 75.0, 90.0, 110.0, 132.0, 160.0,
    200.0, 250.0, 315.0, 355.0, 400.0, 450.0, 500.0, 560.0, 630.0, 710.0, 800.0, 900.0,
    1000.0,
];

/// NEMA MG 1 horsepower ratings with their labels (recalled from memory,
/// brief §6).
pub const NEMA_HP: &[(f64, &str)] = &[
    (1.0 / 20.0, "1/20"),
    (1.0 / 12.0, "1/12"),
    (1.0 / 8.0, "1/8"),
    (1.0 / 6.0, "1/6"),
    (0.25, "1/4"),
    (1.0 / 3.0, "1/3"),
    (0.5, "1/2"),
    (0.75, "3/4"),
    (1.0, "1"),
    (1.5, "1.5"),
    (2.0, "2"),
    (3.0, "3"),
    (5.0, "5"),
    (7.5, "7.5"),
    (10.0, "10"),
    (15.0, "15"),
    (20.0, "20"),
    (25.0, "25"),
    (30.0, "30"),
    (40.0, "40"),
    (50.0, "50"),
    (60.0, "60"),
    (75.0, "75"),
    (100.0, "100"),
    (125.0, "125"),
    (150.0, "150"),
    (200.0, "200"),
    (250.0, "250"),
    (300.0, "300"),
    (350.0, "350"),
    (400.0, "400"),
    (450.0, "450"),
    (500.0, "500"),
];

/// Which standard rating series to choose from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
#[serde(rename_all = "snake_case")]
pub enum MotorSeries {
    /// IEC 60072-1 kW ratings.
    #[default]
    Iec,
    /// NEMA MG 1 hp ratings.
    Nema,
}

/// One standard rating.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Rating {
    /// Rated shaft output (W).
    pub rating_w: f64,
    /// Label as it appears in the series, e.g. `7.5 kW` or `15 hp`.
    pub label: String,
}

/// Every rating of `series`, smallest first.
pub fn ratings(series: MotorSeries) -> Vec<Rating> {
    match series {
        MotorSeries::Iec => IEC_KW
            .iter()
            .map(|&kw| Rating {
                rating_w: kw * 1000.0,
                label: format!("{kw} kW"),
            })
            .collect(),
        MotorSeries::Nema => NEMA_HP
            .iter()
            .map(|&(hp, l)| Rating {
                rating_w: hp * HORSEPOWER,
                label: format!("{l} hp"),
            })
            .collect(),
    }
}

/// RMS of a piecewise-constant duty: `duty` holds (power W, time s) pairs.
/// `None` when the total time is not positive or a value is not finite.
///
/// # Formula
/// `P_rms = √(Σ P_i²·t_i / Σ t_i)` (brief §6, S-21).
pub fn rms_power(duty: &[(f64, f64)]) -> Option<f64> {
    let (mut num, mut den) = (0.0, 0.0);
    for &(p, t) in duty {
        if !p.is_finite() || !t.is_finite() || t < 0.0 {
            return None;
        }
        num += p * p * t;
        den += t;
    }
    (den > 0.0).then(|| (num / den).sqrt())
}

/// The smallest rating of `series` with `rating ≥ rms·(1 + margin)` and
/// `peak ≤ k·rating`; `None` when the series has none large enough.
pub fn select(
    series: MotorSeries,
    rms_w: f64,
    peak_w: f64,
    margin: f64,
    k: f64,
) -> Option<Rating> {
    let need = minimum_rating(rms_w, peak_w, margin, k);
    ratings(series)
        .into_iter()
        .find(|r| r.rating_w >= need * (1.0 - 1e-12))
}

/// The smallest rating the two checks allow, before rounding up to a series:
/// `max(P_rms·(1 + margin), P_peak/k)`.
pub fn minimum_rating(rms_w: f64, peak_w: f64, margin: f64, k: f64) -> f64 {
    (rms_w * (1.0 + margin)).max(peak_w / k)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn series_are_increasing() {
        for s in [MotorSeries::Iec, MotorSeries::Nema] {
            let r = ratings(s);
            assert!(r.windows(2).all(|w| w[0].rating_w < w[1].rating_w), "{s:?}");
        }
    }

    #[test]
    fn rms_rejects_empty_and_bad() {
        assert_eq!(rms_power(&[]), None);
        assert_eq!(rms_power(&[(1.0, 0.0)]), None);
        assert_eq!(rms_power(&[(f64::NAN, 1.0)]), None);
        assert_eq!(rms_power(&[(3.0, 2.0)]), Some(3.0));
    }

    #[test]
    fn nothing_large_enough() {
        assert_eq!(select(MotorSeries::Iec, 2.0e6, 0.0, 0.1, 1.5), None);
    }
}
