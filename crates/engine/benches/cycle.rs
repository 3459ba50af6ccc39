//! Duty-cycle evaluation of each demo design (with compressibility), and the
//! ratio against the SciPy reference solve of the same pressing equation at
//! the same tolerance (target/reference/pressing.json from `make reference`).
use std::time::Instant;

use criterion::{black_box, criterion_group, Criterion};
use kneepoint_engine::cycle::evaluate_cycle;
use kneepoint_engine::design::workshop_press;
use kneepoint_engine::{Circuit, EXAMPLES};

fn bench(c: &mut Criterion) {
    for e in EXAMPLES {
        let circuit = Circuit::new(&(e.build)()).expect("valid demo");
        c.bench_function(&format!("cycle/{}", e.name), |b| {
            b.iter(|| evaluate_cycle(black_box(&circuit)).map(|r| r.totals.cycle_time_s))
        });
    }
}

criterion_group!(benches, bench);

/// Median of 15 batches, seconds per call.
fn median_time(f: &dyn Fn()) -> f64 {
    let mut per = Vec::new();
    for _ in 0..15 {
        let n = 200;
        let t0 = Instant::now();
        for _ in 0..n {
            f();
        }
        per.push(t0.elapsed().as_secs_f64() / n as f64);
    }
    per.sort_by(f64::total_cmp);
    per[per.len() / 2]
}

fn ratio() {
    let d = workshop_press();
    let full = Circuit::new(&d).expect("valid demo");
    // The same equation the SciPy script integrates: approach, then pressing.
    let mut dp = d.clone();
    dp.cycle.segments.truncate(2);
    let press = Circuit::new(&dp).expect("valid");
    let t_full = median_time(&|| {
        black_box(evaluate_cycle(black_box(&full)).ok());
    });
    let t_press = median_time(&|| {
        black_box(evaluate_cycle(black_box(&press)).ok());
    });
    println!(
        "cycle/workshop-press full cycle median {:.1} µs",
        t_full * 1e6
    );
    println!(
        "cycle/workshop-press approach+pressing median {:.1} µs",
        t_press * 1e6
    );
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../target/reference/pressing.json"
    );
    match std::fs::read_to_string(path)
        .ok()
        .and_then(|s| serde_json::from_str::<serde_json::Value>(&s).ok())
        .and_then(|v| v["solve_time_median_s"].as_f64())
    {
        Some(py) => {
            println!("SciPy reference pressing solve median {:.3} ms", py * 1e3);
            println!("ratio SciPy / Kneepoint full cycle: {:.0}x", py / t_full);
            println!(
                "ratio SciPy / Kneepoint approach+pressing: {:.0}x",
                py / t_press
            );
        }
        None => println!("no SciPy figure: run `make reference` for the ratio"),
    }
}

fn main() {
    benches();
    Criterion::default().configure_from_args().final_summary();
    ratio();
}
