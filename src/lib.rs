//! Kneepoint in the browser: inputs, charts and results around the engine.
//!
//! Machine check, pure: [`field_form`], [`field_record`], [`diagram_geom`].
//! Pure modules (no web crates, unit-tested natively): [`fmt`], [`ticks`],
//! [`chart`], [`url_codec`], [`base64url`], [`motor`], [`model`],
//! [`summary`], [`presets`], [`timeline_geom`]. Reactive state: [`state`]. Browser glue:
//! [`browser`]. Components and views: [`components`], [`views`], [`app`].
#![forbid(unsafe_code)]

pub mod app;
pub mod base64url;
pub mod browser;
pub mod chart;
pub mod components;
pub mod design_text;
pub mod diagram_geom;
pub mod field_form;
pub mod field_record;
pub mod fmt;
pub mod model;
pub mod motor;
pub mod presets;
pub mod split;
pub mod state;
pub mod summary;
pub mod ticks;
pub mod timeline_geom;
pub mod url_codec;
pub mod views;

/// Benchmark hook for `make bench-web` (`tests/e2e/bench.mjs`): evaluates
/// the duty cycle of the demo design `name` `runs` times and returns the sum
/// of the cycle times (s), so the work cannot be skipped. The caller times
/// it; NaN for an unknown or invalid demo. Nothing in the page calls it.
/// Async because the cycle's code is in a split module (loaded by the
/// first call, which the bench makes its warm-up).
#[wasm_bindgen::prelude::wasm_bindgen]
pub async fn bench_cycle(name: String, runs: u32) -> f64 {
    cycle_runs(name, runs).await.unwrap_or(f64::NAN)
}

#[leptos::wasm_split::wasm_split(
    kneepoint_cycle_runs,
    wasm_split_path = ::leptos::wasm_split,
    fallible
)]
fn cycle_runs(name: String, runs: u32) -> Result<f64, split::Unloaded> {
    let Some(design) = kneepoint_engine::example(&name) else {
        return Ok(f64::NAN);
    };
    let Ok(circuit) = kneepoint_engine::Circuit::new(&design) else {
        return Ok(f64::NAN);
    };
    Ok((0..runs)
        .filter_map(|_| kneepoint_engine::cycle::evaluate_cycle(&circuit).ok())
        .map(|r| r.totals.cycle_time_s)
        .sum())
}
