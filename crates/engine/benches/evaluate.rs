//! Full steady-state evaluation of each demo design: operating points of
//! every motion, three curves with knees, corners, settings check, warnings.
use criterion::{black_box, criterion_group, criterion_main, Criterion};
use kneepoint_engine::{evaluate, EXAMPLES};

fn bench(c: &mut Criterion) {
    for e in EXAMPLES {
        let d = (e.build)();
        c.bench_function(&format!("evaluate/{}", e.name), |b| {
            b.iter(|| evaluate(black_box(&d)).map(|r| r.curves.points.len()))
        });
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);
