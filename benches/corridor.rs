//! Benchmark of the corridor programme (run with `cargo bench --bench
//! corridor`): generated corridors of 20 and 40 sections varying the demo
//! project (clay 5–15 m, height 3–5.5 m), resources scaled with the number
//! of sections, each planned once; wall time and the 40/20 ratio printed.
//! Not a test: nothing here asserts a time.

use std::path::Path;
use std::time::Instant;

fn corridor_text(n: usize) -> String {
    let mut t = format!(
        "[corridor]\ntitle = \"generated corridor of {n} sections\"\nstart_date = 2027-04-05\n\
         [resources]\nplacing_crews = {}\ndrain_rigs = {}\ndrain_rig_m_per_day = 8000\nplatform_thickness_m = 0.5\n\
         [[resources.supply]]\nname = \"pit\"\nm3_per_day = {}\n",
        n / 4 + 1,
        n / 10 + 1,
        500 * n
    );
    for i in 0..n {
        let soft = 3.5 + ((i * 7) % 11) as f64;
        let height = 3.0 + ((i * 3) % 6) as f64 * 0.5;
        t.push_str(&format!(
            "[[section]]\nname = \"S{i:02}\"\nfrom_m = {}\nto_m = {}\nproject = \"kestrel-fen.toml\"\n\
             set = {{ \"ground.layers[1].thickness_m\" = {soft}, \"drains.depth_m\" = {}, \"embankment.design_height_m\" = {height}, \"embankment.berms[0].height_m\" = 2.0 }}\n",
            100 * i,
            100 * (i + 1),
            soft + 1.5
        ));
    }
    t
}

fn run(n: usize) -> f64 {
    let read = |_: &Path| Ok(include_str!("../examples/kestrel-fen.toml").to_string());
    let c = fillpace::corridor::file::parse(&corridor_text(n), "generated", Path::new(""), &read).expect("valid");
    let t = Instant::now();
    let p = fillpace::corridor::programme::run(&c, &|| {}).expect("programme");
    let s = t.elapsed().as_secs_f64();
    let built = p.sections.iter().filter(|s| s.outcome.is_some()).count();
    println!(
        "corridor {n} sections ({built} buildable) on {} threads: {s:.1} s wall; finish {:?}, bound {:?}",
        rayon::current_num_threads(),
        p.finish,
        p.bounds.latest_unconstrained_finish
    );
    s
}

fn main() {
    let t20 = run(20);
    let t40 = run(40);
    println!("ratio 40/20 sections: {:.2}", t40 / t20);
}
