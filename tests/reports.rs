//! The wording and cautions of every output surface: the caution footer
//! and program version on every PDF page (plan, compare, risk, release
//! certificate), the inputs the PDF shows, the risk caution in JSON, the
//! caution of `new`, and "meets the FS target" instead of "safe".

mod common;
use common::*;

fn assert_footer_on_every_page(pdf: &std::path::Path) {
    let footer: String = fillpace::report::caution_footer();
    let pages = pages_text(pdf);
    assert!(!pages.is_empty());
    for (i, t) in pages.iter().enumerate() {
        assert!(t.contains(&footer), "{}: page {} has no caution footer", pdf.display(), i + 1);
        assert!(
            t.contains(&fillpace::report::program_version()),
            "{}: page {} has no program version",
            pdf.display(),
            i + 1
        );
    }
}

#[test]
fn every_pdf_page_carries_the_caution_footer_and_the_version() {
    let dir = tempfile::tempdir().unwrap();
    let plan = dir.path().join("plan.pdf");
    fillpace().args(["plan", DEMO, "--pdf"]).arg(&plan).assert().success();
    assert_footer_on_every_page(&plan);
    let options = dir.path().join("options.pdf");
    fillpace().args(["compare", DEMO, "--vary", "drains.spacing_m=1.5,2.0", "--pdf"]).arg(&options).assert().success();
    assert_footer_on_every_page(&options);
    let risk = dir.path().join("risk.pdf");
    fillpace()
        .args(["risk", "tests/data/phi0-single-lift.toml", "--runs", "20", "--pdf"])
        .arg(&risk)
        .assert()
        .success();
    assert_footer_on_every_page(&risk);
    for f in ["kestrel-fen.toml", "kestrel-fen-readings.csv"] {
        std::fs::copy(root(&format!("examples/{f}")), dir.path().join(f)).unwrap();
    }
    let cert = dir.path().join("cert.pdf");
    let out = fillpace()
        .arg("release")
        .arg(dir.path().join("kestrel-fen.toml"))
        .arg("--readings")
        .arg(dir.path().join("kestrel-fen-readings.csv"))
        .args(["--lift", "1.0", "--pdf"])
        .arg(&cert)
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    assert_footer_on_every_page(&cert);
}

#[test]
fn the_plan_pdf_shows_every_input() {
    let dir = tempfile::tempdir().unwrap();
    let pdf = dir.path().join("plan.pdf");
    fillpace().args(["plan", DEMO, "--pdf"]).arg(&pdf).assert().success();
    let all = pages_text(&pdf).join(" ");
    // The demo's measured su0 values (kestrel-fen.toml, layers 1 and 2).
    for s in ["30.0 kPa at 0.00 m", "18.0 kPa at 1.50 m", "14.0 kPa at 1.50 m", "26.0 kPa at 14.00 m"] {
        assert!(all.contains(s), "su0 value `{s}` missing");
    }
    // Holidays as the file gives them, the proposed sequence and the instruments.
    for s in ["2027-12-20..2028-01-02", "2028-04-14..2028-04-17", "2028-12-18..2029-01-01", "2028-01-10"] {
        assert!(all.contains(s), "`{s}` missing");
    }
    for id in ["P1", "P2", "P3", "SP1", "SP2", "LM1"] {
        assert!(all.contains(&format!("{id} ")), "instrument {id} missing");
    }
    for gone in ["measured su0 floor", "holiday dates.", "Method statement", "safe lift"] {
        assert!(!all.contains(gone), "`{gone}` still printed");
    }
    assert!(all.contains("Methods and assumptions"));
}

#[test]
fn risk_json_puts_its_own_caution_first() {
    let out = fillpace().args(["risk", "tests/data/phi0-single-lift.toml", "--runs", "5", "--json"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let c = v["cautions"].as_array().unwrap();
    assert_eq!(c[0].as_str(), Some(fillpace::report::RISK_CAUTION));
    assert_eq!(c.len(), fillpace::report::cautions().len() + 1);
}

#[test]
fn new_prints_the_caution_and_the_template_starts_with_it() {
    let dir = tempfile::tempdir().unwrap();
    let out = fillpace().arg("new").arg(dir.path().join("a")).output().unwrap();
    assert!(out.status.success());
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("CAUTION") && text.contains("field monitoring governs"), "{text}");
    let out = fillpace().arg("new").arg(dir.path().join("b")).arg("--json").output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!(!v["cautions"].as_array().unwrap().is_empty());
    let head: String = fillpace::app::TEMPLATE.lines().take(12).collect::<Vec<_>>().join("\n");
    assert!(head.contains("CAUTION") && head.contains("not advice"), "{head}");
}

#[test]
fn assess_says_meets_target_not_safe() {
    let out = fillpace().args(["assess", DEMO]).output().unwrap();
    assert!(out.status.success());
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("meets target from") && text.contains("BELOW TARGET"), "{text}");
    assert!(!text.contains("safe from"));
    let help = fillpace().args(["plan", "--help"]).output().unwrap();
    let help = String::from_utf8_lossy(&help.stdout).split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(help.contains("meets the FS target") && !help.contains("safe lift"), "{help}");
}
