//! Corridor programme checks: a one-section corridor is the section's own
//! plan; without limits the corridor finish is the latest section finish;
//! with limits no day's fill exceeds the supply and no crew or rig is
//! double-booked (rebuilt from the reported works, not from the engine's
//! own book), and every lift replayed on a fresh engine keeps its FS
//! target (property test over small random corridors, few cases: each
//! case plans several sections); volumes add up and match a hand-computed
//! trapezoid; rolling surcharge cuts imported fill by exactly the reused
//! volume; bad corridor files stop with exit code 2 naming file, key and
//! line, writing nothing.

mod common;

use common::{fillpace, root};
use fillpace::corridor::programme::{self, Daily, Programme};
use fillpace::corridor::section::Kind;
use fillpace::corridor::{Corridor, file};
use fillpace::response::Engine;
use fillpace::schedule::{Runner, planner};
use proptest::prelude::*;
use proptest::test_runner::{Config, RngSeed};

/// Corridor text with `[corridor]` on the quick test section's start date.
fn corridor_text(resources: &str, sections: &str) -> String {
    format!("[corridor]\ntitle = \"test corridor\"\nstart_date = 2030-01-07\n{resources}\n{sections}")
}

fn section(name: &str, from: f64, to: f64, extra: &str) -> String {
    format!("[[section]]\nname = \"{name}\"\nfrom_m = {from}\nto_m = {to}\nproject = \"quick.toml\"\n{extra}\n")
}

fn parse(text: &str) -> Corridor {
    file::parse(text, "test-corridor.toml", &root("tests/data/corridor"), &|p| std::fs::read_to_string(p))
        .expect("valid corridor")
}

fn run(c: &Corridor) -> Programme {
    programme::run(c, &|| {}).expect("programme")
}

#[test]
fn one_section_with_unlimited_resources_is_the_sections_own_plan() {
    let c = parse(&corridor_text("", &section("only", 0.0, 100.0, "")));
    let prog = run(&c);
    let own = common::load("tests/data/corridor/quick.toml");
    let engine = Engine::new(&own);
    let plan = planner::plan(&Runner::new(&engine)).expect("plan");
    let o = prog.sections[0].outcome.as_ref().expect("buildable");
    let lifts: Vec<_> = o.works.iter().filter(|w| w.kind == Kind::Lift).collect();
    assert_eq!(lifts.len(), plan.stages.len());
    for (w, s) in lifts.iter().zip(&plan.stages) {
        assert_eq!((w.start, w.end), (s.start, s.end), "stage {}", s.number);
        assert!((w.thickness_m - s.thickness_m).abs() < 1e-12);
        assert!((w.fs_end.unwrap() - s.fs_end).abs() < 1e-12, "{:?} vs {}", w.fs_end, s.fs_end);
        assert_eq!(w.mechanism.as_deref(), Some(s.mechanism.as_str()), "stage {}", s.number);
    }
    let lowest = plan.stages.iter().min_by(|a, b| a.fs_end.total_cmp(&b.fs_end)).unwrap();
    assert_eq!((o.governing_stage, o.governing_mechanism.as_str()), (lowest.number, lowest.mechanism.as_str()));
    assert_eq!(o.finish, plan.finish);
    assert_eq!(prog.finish, Some(plan.finish));
    assert!((o.final_settlement_m - plan.final_primary_settlement_m).abs() < 1e-12);
    // Volumes: the plan's per-metre figures × 100 m (the make-up is the
    // settlement at the finish, made up as the fill is placed).
    assert!((o.placed.design_m3 - 100.0 * plan.volume_design_m3_per_m).abs() < 1e-6);
    let makeup = 100.0 * plan.volume_makeup_m3_per_m;
    assert!((o.placed.makeup_m3 - makeup).abs() <= 1e-9 * makeup, "{} vs {makeup}", o.placed.makeup_m3);
}

#[test]
fn unlimited_resources_finish_with_the_latest_section() {
    let secs = [
        section("a", 0.0, 100.0, ""),
        section("b", 100.0, 250.0, "set = { \"embankment.design_height_m\" = 3.0 }"),
        section("c", 300.0, 400.0, "earliest_start = 2030-03-04"),
    ]
    .concat();
    let prog = run(&parse(&corridor_text("", &secs)));
    let outcomes: Vec<_> = prog.sections.iter().map(|s| s.outcome.as_ref().unwrap()).collect();
    for o in &outcomes {
        assert_eq!(o.finish, o.unconstrained_finish);
    }
    assert_eq!(prog.finish, outcomes.iter().map(|o| o.finish).max());
    assert_eq!(prog.finish, prog.bounds.latest_unconstrained_finish);
    assert!(outcomes[2].start >= chrono::NaiveDate::from_ymd_opt(2030, 3, 4).unwrap());
}

#[test]
fn volumes_add_up_and_match_a_hand_computed_trapezoid() {
    let res = "[resources]\nplatform_thickness_m = 0.5\n";
    let prog = run(&parse(&corridor_text(res, &section("only", 0.0, 100.0, ""))));
    let o = prog.sections[0].outcome.as_ref().unwrap();
    // Hand calculation (quick.toml: design height 4 m, crest 12 m, slopes
    // 2H:1V, no berms; full-footprint stages): the final footprint is
    // 12 + 2·2·4 = 28 m wide, so the 0.5 m platform is a trapezoid 28 m at
    // the base and 28 − 2·2·0.5 = 26 m on top: (28 + 26)/2 · 0.5 = 13.5 m²,
    // × 100 m = 1,350 m³.
    let platform = o.works.iter().find(|w| w.kind == Kind::Platform).expect("platform on a drained section");
    assert!((platform.volume.total() - 1350.0).abs() < 1.35, "{}", platform.volume.total());
    // Lift 1 with the platform under it: its design fill is the layer of
    // the crest height h over the footprint, h·(28 − 2h) m² (mean width
    // 28 − 2h), less the platform; its make-up (the fill in the settlement
    // trough) lies between 0 and the centreline settlement s times the
    // footprint widened by the slopes carried down, s·(28 + 2·2·s), a
    // physical bound.
    let lift = o.works.iter().find(|w| w.kind == Kind::Lift).unwrap();
    let st = lift.state.as_ref().unwrap();
    let h = st.height_m;
    let hand = 100.0 * h * (28.0 - 2.0 * h) - 1350.0;
    assert!((lift.volume.design_m3 - hand).abs() < 1e-3 * hand, "{} vs {hand}", lift.volume.design_m3);
    let s = st.settlement_centre_m;
    assert!(
        lift.volume.makeup_m3 > 0.0 && lift.volume.makeup_m3 < 100.0 * s * (28.0 + 4.0 * s),
        "{}",
        lift.volume.makeup_m3
    );
    // Corridor total = sum over sections and lifts.
    let sum: f64 = o.works.iter().map(|w| w.volume.total()).sum();
    assert!((prog.totals.placed.total() - sum).abs() < 1e-6 * sum);
    assert!((o.placed.total() - sum).abs() < 1e-6 * sum);
}

#[test]
fn rolling_surcharge_cuts_imported_fill_by_the_reused_volume() {
    let sur = "set = { \"embankment.surcharge_height_m\" = 0.5, \"criteria.surcharge_removal_degree\" = 0.5 }";
    let later = "earliest_start = 2030-09-02";
    let secs = [section("first", 0.0, 100.0, sur), section("second", 100.0, 300.0, later)].concat();
    let off = run(&parse(&corridor_text("", &secs)));
    let on = run(&parse(&corridor_text("[resources]\nrolling_surcharge = true\n", &secs)));
    assert!(on.totals.reused_m3 > 1.0, "some surcharge reused: {}", on.totals.reused_m3);
    assert!(on.totals.reused_m3 <= on.totals.removed_m3 + 1e-9);
    assert!((on.totals.placed.total() - off.totals.placed.total()).abs() < 1e-9);
    assert!(off.totals.reused_m3 == 0.0);
    let cut = off.totals.imported_m3 - on.totals.imported_m3;
    assert!((cut - on.totals.reused_m3).abs() < 1e-6, "{cut} vs {}", on.totals.reused_m3);
}

/// Small random corridor: 2 or 3 sections of the quick project.
#[derive(Debug, Clone)]
struct Case {
    heights: Vec<f64>,
    lengths: Vec<f64>,
    supply: f64,
    second_source: Option<(f64, u32)>,
    crews: usize,
    rigs: usize,
    platform: bool,
}

fn case() -> impl Strategy<Value = Case> {
    (
        prop::collection::vec(prop::sample::select(vec![2.5, 3.0, 4.0]), 2..=3),
        prop::collection::vec(40.0..120.0f64, 3),
        2000.0..4000.0f64,
        prop::option::of((200.0..1500.0f64, 5u32..60)),
        1usize..=2,
        1usize..=2,
        any::<bool>(),
    )
        .prop_map(|(heights, lengths, supply, second_source, crews, rigs, platform)| Case {
            heights,
            lengths,
            supply,
            second_source,
            crews,
            rigs,
            platform,
        })
}

fn case_text(k: &Case) -> String {
    let mut res = format!(
        "[resources]\nplacing_crews = {}\ndrain_rigs = {}\ndrain_rig_m_per_day = 3000\nplatform_thickness_m = {}\n[[resources.supply]]\nname = \"pit\"\nm3_per_day = {}\n",
        k.crews,
        k.rigs,
        if k.platform { 0.5 } else { 0.0 },
        k.supply
    );
    if let Some((m3, day)) = k.second_source {
        let from = chrono::NaiveDate::from_ymd_opt(2030, 1, 7).unwrap() + chrono::Duration::days(day.into());
        res.push_str(&format!("[[resources.supply]]\nname = \"port\"\nm3_per_day = {m3}\nfrom = {from}\n"));
    }
    let mut at = 0.0;
    let mut secs = String::new();
    for (i, h) in k.heights.iter().enumerate() {
        let set = format!("set = {{ \"embankment.design_height_m\" = {h} }}");
        secs.push_str(&section(&format!("s{i}"), at, at + k.lengths[i], &set));
        at += k.lengths[i];
    }
    corridor_text(&res, &secs)
}

proptest! {
    #![proptest_config(Config { cases: 4, rng_seed: RngSeed::Fixed(17), failure_persistence: None, ..Config::default() })]

    #[test]
    fn limited_resources_are_never_exceeded_and_every_lift_stays_safe(k in case()) {
        let c = parse(&case_text(&k));
        let prog = run(&c);
        let daily = Daily::of(&prog.sections, false);
        for day in 0..daily.placed.len() {
            let date = c.calendar.date(day as i64).unwrap();
            let open = |from: Option<chrono::NaiveDate>| from.is_none_or(|f| f <= date);
            let cap: f64 = if c.calendar.workable(day as i64) {
                c.resources.supply.iter().filter(|s| open(s.from)).map(|s| s.m3_per_day).sum()
            } else {
                0.0
            };
            prop_assert!(daily.placed[day] <= cap * (1.0 + 1e-9), "day {day}: {} > {cap}", daily.placed[day]);
            prop_assert!(daily.crews[day] <= k.crews, "day {day}: {} crews", daily.crews[day]);
            prop_assert!(daily.rigs[day] <= k.rigs, "day {day}: {} rigs", daily.rigs[day]);
        }
        for (s, spec) in prog.sections.iter().zip(&c.sections) {
            let o = s.outcome.as_ref().unwrap_or_else(|| panic!("{}: {:?}", s.name, s.reason));
            // Replay the lifts on a fresh engine at the dates given.
            let engine = Engine::new(&spec.project);
            let r = Runner::new(&engine);
            let mut st = engine.initial_state();
            for w in o.works.iter().filter(|w| matches!(w.kind, Kind::Lift | Kind::Surcharge)) {
                r.place_on(&mut st, w.start, w.thickness_m).unwrap();
                let fs = r.stability(&st, &mut Default::default()).unwrap().governing_fs();
                prop_assert!(fs >= s.fs_target - 1e-9, "{} stage {:?}: FS {fs}", s.name, w.stage);
            }
            prop_assert!(o.finish >= o.unconstrained_finish);
        }
        prop_assert!(prog.finish >= prog.bounds.latest_unconstrained_finish);
    }
}

/// Write a corridor into a scratch folder with the quick section beside
/// it, run the binary with --csv and --pdf, and return (exit code, stderr,
/// whether anything was written: either output or a temporary file).
fn run_bad(text: &str) -> (Option<i32>, String, bool) {
    let dir = tempfile::tempdir().unwrap();
    std::fs::copy(root("tests/data/corridor/quick.toml"), dir.path().join("quick.toml")).unwrap();
    let path = dir.path().join("bad-corridor.toml");
    std::fs::write(&path, text).unwrap();
    let (csv, pdf) = (dir.path().join("works.csv"), dir.path().join("works.pdf"));
    let out = fillpace().args(["corridor"]).arg(&path).arg("--csv").arg(&csv).arg("--pdf").arg(&pdf).output().unwrap();
    let written = csv.exists() || pdf.exists() || std::fs::read_dir(dir.path()).unwrap().count() != 2;
    (out.status.code(), String::from_utf8_lossy(&out.stderr).into_owned(), written)
}

#[test]
fn bad_corridor_files_name_file_key_and_line() {
    let ok = section("a", 0.0, 100.0, "");
    let cases = [
        (
            corridor_text("", &section("a", 0.0, 100.0, "").replace("quick.toml", "missing.toml")),
            "section[0].project",
            "9:",
        ),
        (corridor_text("", &[ok.clone(), section("b", 50.0, 150.0, "")].concat()), "section[1].from_m", "13:"),
        (
            corridor_text("", &section("a", 0.0, 100.0, "set = { \"embankment.design_hieght_m\" = 5 }")),
            "section[0].set.embankment.design_hieght_m",
            "10:",
        ),
        (
            corridor_text("[resources]\n[[resources.supply]]\nname = \"pit\"\nm3_per_day = -500\n", &ok),
            "resources.supply[0].m3_per_day",
            "7:",
        ),
    ];
    for (text, key, line) in cases {
        let (code, err, written) = run_bad(&text);
        assert_eq!(code, Some(2), "{err}");
        assert!(err.contains("bad-corridor.toml"), "{err}");
        assert!(err.contains(key), "{key} in {err}");
        assert!(err.contains(&format!("bad-corridor.toml:{line}")), "line {line} in {err}");
        assert!(!written, "nothing written");
    }
}

#[test]
fn outputs_carry_sections_activities_and_cautions() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::copy(root("tests/data/corridor/quick.toml"), dir.path().join("quick.toml")).unwrap();
    let path = dir.path().join("c.toml");
    let res =
        "[resources]\nplacing_crews = 1\ndrain_rigs = 1\ndrain_rig_m_per_day = 2000\nplatform_thickness_m = 0.5\n";
    std::fs::write(
        &path,
        corridor_text(res, &[section("west", 0.0, 80.0, ""), section("east", 80.0, 160.0, "")].concat()),
    )
    .unwrap();
    let (csv, ics) = (dir.path().join("w.csv"), dir.path().join("w.ics"));
    let out = fillpace().arg("corridor").arg(&path).arg("--csv").arg(&csv).arg("--ics").arg(&ics).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("Corridor programme") && text.contains("CAUTIONS") && text.contains("Lower bounds"),
        "{text}"
    );
    let csv = std::fs::read_to_string(csv).unwrap();
    assert!(csv.starts_with("# fillpace "), "caution line first");
    assert!(csv.lines().nth(1).unwrap().starts_with("section,kind,stage,start,end,quantity,unit"));
    for kind in [",platform,", ",drains,", ",lift,", ",rest,"] {
        assert!(csv.contains(kind), "{kind} in {csv}");
    }
    let ics = std::fs::read_to_string(ics).unwrap().replace("\r\n ", "");
    assert!(ics.contains("SUMMARY:west: lift 1") && ics.contains("SUMMARY:east: HOLD POINT"), "{ics}");
    assert!(ics.contains("distress"));
    let json = fillpace().arg("corridor").arg(&path).arg("--json").output().unwrap();
    let v = common::json_result(&json.stdout);
    assert_eq!(v["sections"].as_array().unwrap().len(), 2);
    assert!(v["bounds"]["latest_unconstrained_finish"].is_string());
}

/// SHA-256 of a file's bytes, computed here with the sha2 crate directly
/// (not through fillpace's hash module); FIPS 180-4.
fn sha256_of(path: &std::path::Path) -> String {
    use sha2::Digest;
    sha2::Sha256::digest(std::fs::read(path).unwrap()).iter().map(|b| format!("{b:02x}")).collect()
}

/// Every page carries the caution footer, the program version and the
/// engineer of record's sign-off fields.
fn assert_every_page_signed(pages: &[String]) {
    let footer = common::collapse(&fillpace::report::caution_footer());
    for (i, t) in pages.iter().enumerate() {
        for needle in [
            footer.as_str(),
            &fillpace::report::program_version(),
            "Engineer of record:",
            "Name",
            "Signature",
            "Date",
            "Registration / licence no.",
        ] {
            assert!(t.contains(needle), "page {}: no '{needle}' in {t}", i + 1);
        }
    }
}

#[test]
fn the_demo_corridor_pdf_has_its_pages_sections_cautions_and_input_hashes() {
    let dir = tempfile::tempdir().unwrap();
    let pdf = dir.path().join("programme.pdf");
    let corridor = "examples/kestrel-fen-corridor.toml";
    let out = fillpace().args(["corridor", corridor, "--json", "--pdf"]).arg(&pdf).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    // --json is printed as without --pdf.
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["command"], "corridor");
    assert_eq!(v["result"]["sections"].as_array().unwrap().len(), 10);
    let pages = common::pages_text(&pdf);
    // Summary, programme chart (10 sections on one page), weekly fill, long
    // section, section table, files, section sources, then the notes (one
    // page or more, as many as the warnings need).
    let n = pages.len();
    assert!(n >= 8, "{pages:#?}");
    assert!(pages[7..].iter().all(|t| t.contains("Notes, warnings and method")));
    let headings = [
        "Corridor programme: summary",
        "Programme chart",
        "Weekly fill against the supply",
        "Long section",
        "Sections",
        "Inputs: files used and their SHA-256",
        "Inputs: sections, their files and overrides",
        "Notes, warnings and method",
    ];
    for (i, (t, h)) in pages.iter().zip(headings).enumerate() {
        assert!(t.contains(h), "page {}: heading '{h}'", i + 1);
        assert!(t.contains(&format!("Page {} of {n}", i + 1)), "page {} numbered", i + 1);
    }
    assert_every_page_signed(&pages);
    let all = pages.join(" ");
    let c = fillpace::corridor::file::load(&root(corridor)).unwrap();
    for s in &c.sections {
        // On the chart, in the table and among the inputs.
        for page in [1, 4, 6] {
            assert!(pages[page].contains(&s.name), "'{}' on page {}", s.name, page + 1);
        }
    }
    assert!(pages[1].contains("CANNOT BE BUILT") && pages[4].contains("CANNOT BE BUILT"));
    for note in fillpace::report::cautions() {
        assert!(pages[0].contains(&common::collapse(&note)), "caution '{note}' on the summary");
    }
    // The corridor file and both section files, hashed here independently.
    for file in [corridor, "examples/kestrel-fen.toml", "examples/kestrel-fen-low.toml"] {
        let sha = sha256_of(&root(file));
        assert!(pages[5].contains(&sha), "SHA-256 of {file} ({sha})");
    }
    assert!(all.matches("CANNOT BE BUILT").count() >= 3, "chart, table, long section");
}

#[test]
fn a_forty_section_corridor_pdf_shows_every_section_on_paginated_pages() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::copy(root("tests/data/corridor/quick.toml"), dir.path().join("quick.toml")).unwrap();
    let names: Vec<String> = (1..=40).map(|i| format!("S{i:02} generated length {}", i * 100)).collect();
    let secs: String = names
        .iter()
        .enumerate()
        .map(|(i, n)| section(n, 100.0 * i as f64, 100.0 * (i + 1) as f64, &format!("priority = {}", i % 3 + 1)))
        .collect();
    let res = "[resources]\nplacing_crews = 6\n[[resources.supply]]\nname = \"pit\"\nm3_per_day = 20000\n";
    let path = dir.path().join("forty.toml");
    std::fs::write(&path, corridor_text(res, &secs)).unwrap();
    let pdf = dir.path().join("forty.pdf");
    let out = fillpace().arg("corridor").arg(&path).arg("--pdf").arg(&pdf).arg("--quiet").output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let pages = common::pages_text(&pdf);
    let with = |h: &str| pages.iter().filter(|t| t.contains(h)).cloned().collect::<Vec<_>>();
    // 16 sections a chart page, 26 rows a table page (40 + the totals row),
    // 26 rows a sources page (one row a section here).
    let chart = with("Programme chart");
    let table = with("mechanism (stage)");
    let sources = with("Inputs: sections, their files and overrides");
    assert_eq!((chart.len(), table.len(), sources.len()), (3, 2, 2));
    for n in &names {
        for (what, group) in [("chart", &chart), ("table", &table), ("sources", &sources)] {
            let k = group.iter().filter(|t| t.contains(n.as_str())).count();
            assert_eq!(k, 1, "'{n}' on exactly one {what} page");
        }
    }
    assert!(table[1].contains("Corridor total"));
    assert_every_page_signed(&pages);
    let total = pages.len();
    assert!(pages.iter().enumerate().all(|(i, t)| t.contains(&format!("Page {} of {total}", i + 1))));
}

#[test]
fn the_pdf_never_overwrites_a_section_file() {
    let dir = tempfile::tempdir().unwrap();
    let quick = dir.path().join("quick.toml");
    std::fs::copy(root("tests/data/corridor/quick.toml"), &quick).unwrap();
    let before = std::fs::read(&quick).unwrap();
    let path = dir.path().join("c.toml");
    std::fs::write(&path, corridor_text("", &section("a", 0.0, 100.0, ""))).unwrap();
    let out = fillpace().arg("corridor").arg(&path).arg("--pdf").arg(&quick).output().unwrap();
    assert_eq!(out.status.code(), Some(2), "{}", String::from_utf8_lossy(&out.stderr));
    assert!(String::from_utf8_lossy(&out.stderr).contains("is also an input"));
    assert_eq!(std::fs::read(&quick).unwrap(), before, "the section file is untouched");
}
