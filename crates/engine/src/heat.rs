//! Heat in the oil: throttling rise, reservoir dissipation, cooler size
//! (brief §7).
//!
//! # Formula
//! ```text
//! ΔT_throttle = Δp/(ρ·c_p)                 oil crossing a relief, unloader or valve
//! H           = U·A·ΔT                      reservoir dissipation (S-18)
//! ΔT_∞        = P_heat/(U·A)                steady rise of the lumped tank
//! τ           = m_oil·c_p/(U·A)             its time constant (tank metal ignored)
//! T(t)        = T_amb + ΔT_∞·(1 − e^(−t/τ))
//! P_cooler    = max(0, P_heat − U·A·(T_max − T_amb))
//! V_tank      = 3 × pump flow per minute    (US HPU practice, S-17)
//! ```
//! where ρ is the oil density, c_p its specific heat (about 1.9 kJ/(kg·K),
//! from memory), U the wall heat-transfer coefficient (about 11.4 W/(m²·K)
//! "with adequate air circulation", S-18) and A the oil-wetted wall area
//! (counting only wetted area is common practice, no source).

/// Default wall heat-transfer coefficient, 2 BTU/(h·ft²·°F) ≈ 11.4 W/(m²·K)
/// (brief §7.2, S-18).
pub const RESERVOIR_U_W_M2K: f64 = 11.4;
/// Default specific heat of mineral oil (J/(kg·K)), from memory (brief §4).
pub const OIL_SPECIFIC_HEAT_J_KGK: f64 = 1900.0;
/// Bulk oil temperatures (°C) at which Kneepoint warns, alarms and gives a
/// hard warning: 60, 70, 80 (brief §7.2, rule of thumb, no source).
pub const OIL_TEMPERATURE_LEVELS_C: [f64; 3] = [60.0, 70.0, 80.0];
/// Reservoir volume rule: this many minutes of pump flow (S-17).
pub const RESERVOIR_MINUTES_OF_FLOW: f64 = 3.0;

/// Temperature rise of oil throttled across `dp` (K): Δp/(ρ·c_p).
pub fn throttling_rise(dp_pa: f64, density_kg_m3: f64, cp_j_kgk: f64) -> f64 {
    dp_pa / (density_kg_m3 * cp_j_kgk)
}

/// Steady temperature rise of the reservoir (K): P/(U·A).
pub fn steady_rise(heat_w: f64, u_w_m2k: f64, area_m2: f64) -> f64 {
    heat_w / (u_w_m2k * area_m2)
}

/// Time constant of the lumped reservoir (s): m·c_p/(U·A).
pub fn time_constant(mass_kg: f64, cp_j_kgk: f64, u_w_m2k: f64, area_m2: f64) -> f64 {
    mass_kg * cp_j_kgk / (u_w_m2k * area_m2)
}

/// Wetted area needed to hold the rise to `rise_k` without a cooler (m²):
/// P/(U·ΔT).
pub fn area_for_rise(heat_w: f64, u_w_m2k: f64, rise_k: f64) -> f64 {
    heat_w / (u_w_m2k * rise_k)
}

/// Cooler rating needed so the tank stays within `rise_k` of ambient (W):
/// max(0, P − U·A·ΔT).
pub fn cooler_needed(heat_w: f64, u_w_m2k: f64, area_m2: f64, rise_k: f64) -> f64 {
    (heat_w - u_w_m2k * area_m2 * rise_k).max(0.0)
}

/// Reservoir volume by the 3-minutes-of-flow rule (m³) for pump flow `q` (m³/s).
pub fn reservoir_volume_rule(q_m3s: f64) -> f64 {
    RESERVOIR_MINUTES_OF_FLOW * 60.0 * q_m3s
}

/// Estimated oil-wetted wall area of a tank holding `volume_m3` of oil when
/// none is entered (m²): the oil taken as a cube, floor plus four walls,
/// 5·V^(2/3). Our own estimate: about 2.6 m² for 370 L, where the brief
/// quotes "about 3 m²" for such a tank (rule of thumb).
pub fn wetted_area_estimate(volume_m3: f64) -> f64 {
    5.0 * volume_m3.max(0.0).powf(2.0 / 3.0)
}

/// Oil temperature after `t_s` seconds from ambient (°C), lumped model.
pub fn temperature_after(ambient_c: f64, rise_inf_k: f64, tau_s: f64, t_s: f64) -> f64 {
    ambient_c + rise_inf_k * (1.0 - (-t_s / tau_s).exp())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn relief_rise_per_brief() {
        // Brief §7.1: about 0.6 K per 10 bar; 11.6 K at 190 bar (870 kg/m³,
        // 1.9 kJ/(kg·K)); derived, [D].
        let r10 = throttling_rise(10.0e5, 870.0, 1900.0);
        assert!((r10 - 0.605).abs() < 0.005, "{r10}");
        let r190 = throttling_rise(190.0e5, 870.0, 1900.0);
        assert!((r190 - 11.49).abs() < 0.2, "{r190}");
    }

    #[test]
    fn no_cooler_when_area_suffices() {
        assert_eq!(cooler_needed(100.0, 11.4, 10.0, 30.0), 0.0);
    }
}
