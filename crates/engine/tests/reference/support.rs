//! Table rows in the style of statrs' reference tests: what is checked, the
//! value the engine gives, the reference value, the tolerance and where the
//! reference comes from. Every failing row of a table is reported at once.

use kneepoint_engine::design::Design;
use kneepoint_engine::units::{LITRE, MINUTE, US_GALLON};

/// One US gallon per minute in m³/s.
pub const GPM: f64 = US_GALLON / MINUTE;
/// One litre per minute in m³/s.
pub const LPM: f64 = LITRE / MINUTE;

/// How close `got` must be to `expected`.
#[derive(Clone, Copy, Debug)]
pub enum Tol {
    /// |got − expected| ≤ tol·|expected|.
    Rel(f64),
    /// |got − expected| ≤ tol.
    Abs(f64),
}

/// Tolerance for closed-form results (brief §10: ±0.1 %).
pub const CLOSED_FORM: Tol = Tol::Rel(1e-3);

/// One reference row.
#[derive(Clone, Copy, Debug)]
pub struct Row {
    /// What is checked, with its display unit.
    pub what: &'static str,
    /// The engine's value, in the same unit as `expected`.
    pub got: f64,
    /// The reference value.
    pub expected: f64,
    /// Allowed difference.
    pub tol: Tol,
    /// Where the reference value comes from.
    pub source: &'static str,
}

/// Shorthand constructor.
pub fn row(
    what: &'static str,
    got: f64,
    expected: f64,
    tol: Tol,
    source: &'static str,
) -> Row {
    Row {
        what,
        got,
        expected,
        tol,
        source,
    }
}

impl Row {
    fn passes(&self) -> bool {
        let allowed = match self.tol {
            Tol::Rel(r) => r * self.expected.abs(),
            Tol::Abs(a) => a,
        };
        (self.got - self.expected).abs() <= allowed
    }
}

/// Checks every row of a table; the panic lists every failing row.
pub fn check(table: &str, rows: &[Row]) {
    assert!(!rows.is_empty(), "{table}: empty table");
    let failures: Vec<String> = rows
        .iter()
        .filter(|r| !r.passes())
        .map(|r| {
            format!(
                "  {}: got {}, expected {} ({:?}) [{}]",
                r.what, r.got, r.expected, r.tol, r.source
            )
        })
        .collect();
    assert!(
        failures.is_empty(),
        "{table}: {} of {} rows outside tolerance\n{}",
        failures.len(),
        rows.len(),
        failures.join("\n")
    );
}

/// Shaft speed of the ideal test circuits (rpm).
pub const IDEAL_RPM: f64 = 1800.0;

/// An ideal test circuit built on the default design: both pumps with
/// volumetric efficiency 1 (no leakage) and the given hydro-mechanical
/// efficiency, no drag torque, a check valve with no cracking pressure and
/// no drop, no valve or line drops, no hoses, no unloaded back-pressure and
/// the narrowest unloader band the engine accepts (0.1 %). Flows are the
/// pumps' theoretical flows (m³/s) at [`IDEAL_RPM`].
pub fn ideal(q_large: f64, q_small: f64, eta_hm: f64) -> Design {
    let mut d = Design::default();
    d.drive.speed_rpm = IDEAL_RPM;
    for (p, q) in [(&mut d.large_pump, q_large), (&mut d.small_pump, q_small)] {
        p.displacement_m3 = q / (IDEAL_RPM / 60.0);
        p.volumetric_efficiency = 1.0;
        p.hydromechanical_efficiency = eta_hm;
        p.no_load_torque_nm = 0.0;
    }
    d.check_valve.cracking_pa = 0.0;
    d.check_valve.rated_drop_pa = 0.0;
    d.unloading_valve.band_fraction = 0.001;
    d.unloading_valve.back_pressure_pa = 0.0;
    let dv = &mut d.directional_valve;
    dv.drop_p_a_pa = 0.0;
    dv.drop_b_t_pa = 0.0;
    dv.drop_p_b_pa = 0.0;
    dv.drop_a_t_pa = 0.0;
    d.lines.pressure_drop_pa = 0.0;
    d.lines.return_drop_pa = 0.0;
    d.lines.pressure_hose = None;
    d.lines.return_hose = None;
    d
}
