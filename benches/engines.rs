//! Benchmarks of the three engines on the demo site (run with
//! `cargo bench --bench engines`). Each case is repeated and the median
//! wall time reported with its throughput. Not a test: nothing here asserts
//! a time. `FILLPACE_BENCH_ONLY=response` runs case 1 only (e.g. under
//! `valgrind --tool=callgrind`, whose instruction counts repeat exactly),
//! `FILLPACE_BENCH_ONLY=search` cases 2 and 2b (after one cold and one
//! warm run of case 1), `FILLPACE_BENCH_ONLY=plan` cases 1 to 3b. Case 1 is
//! timed cold (the engine builds its elastic stress tables) and warm (it
//! finds them kept by the process from an earlier engine of the same
//! geometry).

use fillpace::response::Engine;
use fillpace::schedule::{Effort, Runner, planner};
use fillpace::stability::{Circle, Section, search::search};
use std::time::{Duration, Instant};

fn median(mut v: Vec<Duration>) -> Duration {
    v.sort();
    v[v.len() / 2]
}

fn time<T>(runs: usize, mut f: impl FnMut() -> T) -> (Duration, T) {
    let mut times = Vec::new();
    let mut last = None;
    for _ in 0..runs {
        let t = Instant::now();
        last = Some(f());
        times.push(t.elapsed());
    }
    (median(times), last.expect("at least one run"))
}

fn main() {
    let text = include_str!("../examples/kestrel-fen.toml");
    let p = fillpace::input::parse(text, "kestrel-fen.toml").expect("demo validates");

    let only = std::env::var("FILLPACE_BENCH_ONLY").unwrap_or_default();

    // 1. Full ground response: all columns, the proposed sequence, then rest
    //    to three years, daily steps during placement and 2-day steps in rests.
    //    Cold: each run's engine builds its own elastic stress tables (as the
    //    first engine of a geometry in a process does); warm: each run's
    //    engine is new but finds the tables kept by the process (as every
    //    later engine of the same geometry does), after one run to fill them.
    let response = |e: &Engine| {
        let r = Runner::new(e);
        let mut st = e.initial_state();
        let mut steps = 0usize;
        for l in &p.sequence {
            r.rest_until(&mut st, r.calendar.day_of(l.start), &mut |_| steps += 1);
            r.place(&mut st, l.thickness_m, &mut |_| steps += 1).unwrap();
        }
        r.rest_until(&mut st, 3 * 365, &mut |_| steps += 1);
        steps
    };
    let runs = if only == "search" { 1 } else { 10 };
    let (cold, steps) = time(runs, || response(&Engine::with_own_tables(&p)));
    response(&Engine::new(&p));
    let (warm, _) = time(runs, || response(&Engine::new(&p)));
    let e = Engine::new(&p);
    let nodes: usize = e.columns.iter().map(|c| c.nodes.len()).sum();
    let node_steps = (steps * nodes) as f64;
    for (what, t) in [("cold (stress tables built)", cold), ("warm (stress tables kept)", warm)] {
        println!(
            "response  3 years, {} columns, {nodes} nodes, {steps} steps, {what}: {:.1} ms median, {:.1} M node-steps/s",
            e.columns.len(),
            t.as_secs_f64() * 1e3,
            node_steps / t.as_secs_f64() / 1e6
        );
    }
    if only == "response" {
        return;
    }

    // 2. One full slip-circle search on the demo section at 6 m.
    let st = e.initial_state();
    let field = e.field(&st);
    let section = Section::new(&p, 6.0, &field);
    let (t, r) = time(20, || search(&section).unwrap());
    println!(
        "stability one search, {} circles: {:.1} ms median, {:.0} circles/s",
        r.circles_tried,
        t.as_secs_f64() * 1e3,
        r.circles_tried as f64 / t.as_secs_f64()
    );

    // 2b. Cost growth with the number of circles: the critical circle's
    //     neighbourhood analysed on a lattice of n and of 2n centres (the
    //     same radii), one thread.
    let c0 = r.critical.circle;
    let lattice = |n: usize| -> Vec<Circle> {
        (0..n)
            .map(|k| Circle {
                xc_m: c0.xc_m + 0.01 * (k % 50) as f64,
                yc_m: c0.yc_m + 0.01 * (k / 50) as f64,
                r_m: c0.r_m + 0.01 * (k / 50) as f64,
            })
            .collect()
    };
    let (one, two) = (lattice(2_000), lattice(4_000));
    let analyse_all = |cs: &[Circle]| cs.iter().filter_map(|c| section.analyse(*c).ok()).count();
    let (t1, _) = time(5, || analyse_all(&one));
    let (t2, _) = time(5, || analyse_all(&two));
    println!(
        "stability 2,000 and 4,000 circles analysed: {:.1} and {:.1} ms median, ratio {:.2}",
        t1.as_secs_f64() * 1e3,
        t2.as_secs_f64() * 1e3,
        t2.as_secs_f64() / t1.as_secs_f64()
    );
    if only == "search" {
        return;
    }

    // 3. The whole plan.
    let (t, plan) = time(3, || {
        let e = Engine::new(&p);
        planner::plan(&Runner::new(&e)).unwrap()
    });
    let Effort { stability_searches, warm_searches, consolidation_steps } = plan.effort;
    println!(
        "plan      {} stages, {stability_searches} full and {warm_searches} warm stability searches, {consolidation_steps} consolidation steps: {:.0} ms median",
        plan.stages.len(),
        t.as_secs_f64() * 1e3
    );

    // 3b. The same plan with every trial by the full search (the reference
    //     path of the guard-rail tests).
    let (t, full) = time(3, || {
        let e = Engine::new(&p);
        let mut r = Runner::new(&e);
        r.exhaustive = true;
        planner::plan(&r).unwrap()
    });
    println!(
        "plan      exhaustive trials: {} full stability searches: {:.0} ms median",
        full.effort.stability_searches,
        t.as_secs_f64() * 1e3
    );
    if only == "plan" {
        return;
    }

    // 4. Monte Carlo: realisations of the demo's uncertain parameters, each
    //    checking the timetable and planning afresh, on one thread and on
    //    all cores. FILLPACE_BENCH_RUNS sets the number (default 40).
    let runs: usize = std::env::var("FILLPACE_BENCH_RUNS").ok().and_then(|v| v.parse().ok()).unwrap_or(40);
    let doc = fillpace::input::vary::Document::parse(text, "kestrel-fen.toml").expect("demo parses");
    let cores = std::thread::available_parallelism().map_or(1, |n| n.get());
    let mut rate = Vec::new();
    for threads in [1, cores] {
        let opts = fillpace::risk::RiskOptions { runs, seed: 1, threads: Some(threads) };
        let (t, _) = time(1, || fillpace::risk::run(&doc, &p, &plan, opts, None, &|| {}).unwrap());
        rate.push(runs as f64 / t.as_secs_f64());
        println!(
            "risk      {runs} realisations on {threads} thread(s): {:.1} s, {:.2} realisations/s",
            t.as_secs_f64(),
            rate[rate.len() - 1]
        );
    }
    println!("risk      parallel speed-up on {cores} cores: {:.2}", rate[1] / rate[0]);
}
