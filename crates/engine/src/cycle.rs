//! Duty cycle over a load profile: time, energy, heat, motor and
//! requirements (brief §5–§7). Method, equations and sources: `docs/cycle.md`.
//!
//! [`evaluate_cycle`] runs the design's profile (or one derived from its
//! loads) through the quasi-static integrator with oil compressibility
//! ([`CycleOptions`] sets its tolerance), then sizes the motor by RMS and
//! peak power, works out the reservoir's heat balance, checks the
//! requirements and collects warnings. Pure and deterministic: the same
//! circuit gives the same report, bit for bit, native and wasm.
//!
//! ```
//! use kneepoint_engine::{cycle::evaluate_cycle, Circuit, Design};
//! let c = Circuit::new(&Design::default()).expect("valid demo");
//! let r = evaluate_cycle(&c).expect("the demo cycle runs");
//! assert!(r.totals.cycle_time_s > 0.0);
//! assert!(r.samples.len() <= kneepoint_engine::cycle::MAX_SAMPLES);
//! ```

mod integrate;
mod results;
mod spec;
mod warn;

pub use integrate::CycleOptions;
pub use results::{
    Change, CycleError, CycleReport, CycleTotals, HeatBySource, HeatReport, MotorReport,
    RequirementKind, RequirementResult, Sample, SegmentResult, SolverInfo,
};
pub use spec::{
    derived_profile, CycleSpec, ForcePoint, Hold, MotorSelection, PressingForce,
    Requirements, Reservoir, Segment, SegmentKind, CENTRE_PRESSURE_PA, DEAD_VOLUME_M3,
    MAX_SEGMENTS, MAX_SEGMENT_TIME_S, MAX_TABLE_POINTS,
};
pub use warn::{CycleWarning, CycleWarningKind};

pub(crate) use spec::validate;

use crate::circuit::Circuit;
use crate::heat;
use crate::motor;
use integrate::RunOutput;

/// Most samples in the time series.
pub const MAX_SAMPLES: usize = 400;

/// Evaluates the duty cycle of a validated circuit with the default options.
///
/// # Errors
/// [`CycleError::ForceNotReachable`] when a force of the profile needs the
/// relief's full-flow pressure (the cylinder stalls), with the position;
/// [`CycleError::NotConverged`] if the step halving fails (not seen for
/// valid designs; a variant rather than a NaN).
pub fn evaluate_cycle(c: &Circuit) -> Result<CycleReport, CycleError> {
    evaluate_cycle_with(c, CycleOptions::default())
}

/// As [`evaluate_cycle`] with explicit integration options.
///
/// # Errors
/// As [`evaluate_cycle`].
pub fn evaluate_cycle_with(
    c: &Circuit,
    opts: CycleOptions,
) -> Result<CycleReport, CycleError> {
    let (segments, derived) = profile(c);
    let out = integrate::run(c, &segments, opts)?;
    let totals = totals(c, &out);
    let motor = motor_report(c, &totals);
    let heat = heat_report(c, &totals);
    let requirements = requirements(c, &out, &totals, opts);
    let warnings = warn::collect(c, &out, &totals, &motor, &heat);
    Ok(CycleReport {
        profile_derived: derived,
        solver: SolverInfo {
            tolerance: opts.tolerance,
            panels: out.panels,
            evaluations: out.evaluations,
        },
        samples: thin(&out.samples, MAX_SAMPLES),
        segments: out.segments,
        totals,
        motor,
        heat,
        requirements,
        warnings,
    })
}

/// The profile to run: the design's, or one derived from its loads.
fn profile(c: &Circuit) -> (Vec<Segment>, bool) {
    let d = c.design();
    if d.cycle.segments.is_empty() {
        (derived_profile(d), true)
    } else {
        (d.cycle.segments.clone(), false)
    }
}

fn totals(c: &Circuit, out: &RunOutput) -> CycleTotals {
    let d = c.design();
    let mut heat = HeatBySource::default();
    let (mut e_in, mut work, mut t) = (0.0, 0.0, 0.0);
    let (mut peak, mut torque, mut p_max) = (0.0_f64, 0.0_f64, 0.0_f64);
    for s in &out.segments {
        e_in += s.energy_in_j;
        work += s.work_out_j;
        t += s.time_s;
        heat.relief_j += s.heat.relief_j;
        heat.unloaded_j += s.heat.unloaded_j;
        heat.valves_lines_j += s.heat.valves_lines_j;
        heat.pumps_j += s.heat.pumps_j;
        peak = peak.max(s.peak_power_w);
        torque = torque.max(s.peak_torque_nm);
        p_max = p_max.max(s.pressure_max_pa);
    }
    let per = |x: f64| if t > 0.0 { x / t } else { 0.0 };
    CycleTotals {
        cycle_time_s: t,
        cycles_per_hour: if t > 0.0 { 3600.0 / t } else { 0.0 },
        energy_in_j: e_in,
        electrical_energy_j: e_in / d.drive.motor_efficiency,
        work_out_j: work,
        heat,
        stored_end_j: out.stored_end_j,
        mean_power_w: per(e_in),
        peak_power_w: peak,
        rms_power_w: per(out.p2t).max(0.0).sqrt(),
        peak_torque_nm: torque,
        pressure_max_pa: p_max,
    }
}

fn motor_report(c: &Circuit, t: &CycleTotals) -> MotorReport {
    let d = c.design();
    let m = &d.cycle.motor;
    let recommended = motor::select(
        m.series,
        t.rms_power_w,
        t.peak_power_w,
        m.margin_fraction,
        m.peak_allowance,
    );
    let chosen = m.chosen_rating_w.or(d.drive.motor_rating_w);
    let checked = chosen.or(recommended.as_ref().map(|r| r.rating_w));
    let eta = d.drive.motor_efficiency;
    MotorReport {
        series: m.series,
        margin_fraction: m.margin_fraction,
        peak_allowance: m.peak_allowance,
        minimum_w: motor::minimum_rating(
            t.rms_power_w,
            t.peak_power_w,
            m.margin_fraction,
            m.peak_allowance,
        ),
        recommended,
        checked_rating_w: checked,
        checked_is_chosen: chosen.is_some(),
        peak_loading: checked.map(|r| t.peak_power_w / r),
        rms_loading: checked.map(|r| t.rms_power_w / r),
        electrical_mean_w: t.mean_power_w / eta,
        electrical_peak_w: t.peak_power_w / eta,
        motor_efficiency: eta,
    }
}

fn heat_report(c: &Circuit, t: &CycleTotals) -> HeatReport {
    let d = c.design();
    let r = &d.cycle.reservoir;
    let rho = d.oil.density_kg_m3;
    let cp = r.specific_heat_j_kgk;
    let q_pumps = c.large_theoretical_flow() + c.small_theoretical_flow();
    let volume = r
        .oil_volume_m3
        .unwrap_or_else(|| heat::reservoir_volume_rule(q_pumps));
    let area = r
        .wetted_area_m2
        .unwrap_or_else(|| heat::wetted_area_estimate(volume));
    let u = r.heat_transfer_w_m2k;
    let mean = if t.cycle_time_s > 0.0 {
        ((t.energy_in_j - t.work_out_j - t.stored_end_j) / t.cycle_time_s).max(0.0)
    } else {
        0.0
    };
    let rise = heat::steady_rise(mean, u, area);
    let allowed = r.max_oil_c - r.ambient_c;
    let p_bp = c.back_pressure(c.large_theoretical_flow());
    HeatReport {
        mean_heat_w: mean,
        relief_rise_k: heat::throttling_rise(c.relief_full_pa(), rho, cp),
        unloader_rise_k: heat::throttling_rise(p_bp, rho, cp),
        oil_volume_m3: volume,
        oil_volume_estimated: r.oil_volume_m3.is_none(),
        wetted_area_m2: area,
        wetted_area_estimated: r.wetted_area_m2.is_none(),
        heat_transfer_w_m2k: u,
        steady_rise_k: rise,
        steady_oil_c: r.ambient_c + rise,
        time_constant_s: heat::time_constant(rho * volume, cp, u, area),
        ambient_c: r.ambient_c,
        max_oil_c: r.max_oil_c,
        area_needed_m2: heat::area_for_rise(mean, u, allowed),
        cooler_w: heat::cooler_needed(mean, u, area, allowed),
    }
}

/// Mean speed over all segments of `kind`: their distance over their time.
fn mean_speed(out: &RunOutput, kind: SegmentKind) -> Option<f64> {
    let (mut d, mut t) = (0.0, 0.0);
    for s in out.segments.iter().filter(|s| s.kind == kind) {
        d += s.distance_m;
        t += s.time_s;
    }
    (t > 0.0).then(|| d / t)
}

fn requirements(
    c: &Circuit,
    out: &RunOutput,
    t: &CycleTotals,
    opts: CycleOptions,
) -> Vec<RequirementResult> {
    let q = &c.design().cycle.requirements;
    let mut v = Vec::new();
    let speed = |kind, need: f64, got: Option<f64>, fixes: &[Pump]| {
        let met = got.is_some_and(|g| g >= need);
        RequirementResult {
            kind,
            required: need,
            achieved: got,
            met,
            margin: got.map(|g| g / need - 1.0),
            fix: if met {
                None
            } else {
                smallest_fix(c, opts, fixes, &|o: &RunOutput, _| {
                    mean_speed(o, segment_of(kind)).is_some_and(|g| g >= need)
                })
            },
        }
    };
    if let Some(need) = q.approach_speed_ms {
        v.push(speed(
            RequirementKind::ApproachSpeed,
            need,
            mean_speed(out, SegmentKind::Approach),
            &[Pump::Large],
        ));
    }
    if let Some(need) = q.pressing_speed_ms {
        v.push(speed(
            RequirementKind::PressingSpeed,
            need,
            mean_speed(out, SegmentKind::Pressing),
            &[Pump::Small],
        ));
    }
    if let Some(need) = q.cycle_time_s {
        let got = t.cycle_time_s;
        let met = got <= need;
        v.push(RequirementResult {
            kind: RequirementKind::CycleTime,
            required: need,
            achieved: Some(got),
            met,
            margin: Some(1.0 - got / need),
            fix: if met {
                None
            } else {
                smallest_fix(c, opts, &[Pump::Small, Pump::Large], &|_, time| {
                    time <= need
                })
            },
        });
    }
    v
}

fn segment_of(kind: RequirementKind) -> SegmentKind {
    match kind {
        RequirementKind::ApproachSpeed => SegmentKind::Approach,
        _ => SegmentKind::Pressing,
    }
}

#[derive(Clone, Copy)]
enum Pump {
    Small,
    Large,
}

/// Largest factor tried on a displacement when looking for a fix.
const FIX_MAX_FACTOR: f64 = 16.0;

/// The smallest single displacement change (among `pumps`) that makes `ok`
/// true, by bisection on the displacement with everything else fixed.
/// `None` when no pump up to 16× its displacement meets it.
fn smallest_fix(
    c: &Circuit,
    opts: CycleOptions,
    pumps: &[Pump],
    ok: &dyn Fn(&RunOutput, f64) -> bool,
) -> Option<Change> {
    let d = c.design();
    let (segments, _) = profile(c);
    let meets = |pump: Pump, vg: f64| -> bool {
        let mut dd = d.clone();
        match pump {
            Pump::Small => dd.small_pump.displacement_m3 = vg,
            Pump::Large => dd.large_pump.displacement_m3 = vg,
        }
        let Ok(cc) = Circuit::new(&dd) else {
            return false;
        };
        match integrate::run(&cc, &segments, opts) {
            Ok(o) => {
                let t: f64 = o.segments.iter().map(|s| s.time_s).sum();
                ok(&o, t)
            }
            Err(_) => false,
        }
    };
    let mut best: Option<Change> = None;
    for &pump in pumps {
        let from = match pump {
            Pump::Small => d.small_pump.displacement_m3,
            Pump::Large => d.large_pump.displacement_m3,
        };
        let (mut lo, mut hi) = (from, from * FIX_MAX_FACTOR);
        if !meets(pump, hi) {
            continue;
        }
        // Bisection to 0.1 % of the displacement.
        while hi - lo > 1e-3 * from {
            let mid = 0.5 * (lo + hi);
            if meets(pump, mid) {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        let ch = match pump {
            Pump::Small => Change::SmallPumpDisplacement {
                from_m3: from,
                to_m3: hi,
            },
            Pump::Large => Change::LargePumpDisplacement {
                from_m3: from,
                to_m3: hi,
            },
        };
        if best.is_none_or(|b| ch.relative() < b.relative()) {
            best = Some(ch);
        }
    }
    best
}

/// At most `max` samples, chosen by index: every segment's first and last
/// sample, then evenly spread indices. Deterministic.
fn thin(s: &[Sample], max: usize) -> Vec<Sample> {
    if s.len() <= max {
        return s.to_vec();
    }
    let mut keep = vec![false; s.len()];
    let mut must = 0;
    for i in 0..s.len() {
        let first = i == 0 || s[i - 1].segment != s[i].segment;
        let last = i + 1 == s.len() || s[i + 1].segment != s[i].segment;
        if (first || last) && must < max {
            keep[i] = true;
            must += 1;
        }
    }
    let budget = max - must;
    if budget > 0 {
        let n = s.len();
        for k in 0..budget {
            let i = (k as f64 + 0.5) / budget as f64 * n as f64;
            let i = (i as usize).min(n - 1);
            keep[i] = true;
        }
    }
    let mut v: Vec<Sample> = s
        .iter()
        .zip(&keep)
        .filter(|(_, k)| **k)
        .map(|(x, _)| *x)
        .collect();
    v.truncate(max);
    v
}
