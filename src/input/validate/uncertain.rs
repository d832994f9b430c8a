//! Checks of the `[[uncertain]]` and `[[correlation]]` entries: names,
//! keys that hold numbers in the file, distributions and their parameters,
//! and a positive-definite correlation matrix.

use super::{Check, Low};
use crate::input::raw::{RawCorrelation, RawUncertain};
use crate::input::vary::Document;
use crate::model::{Correlation, Distribution, Uncertain, Uncertainty};

pub(super) fn uncertainty(c: &mut Check, raw: &[RawUncertain], corr: &[RawCorrelation], doc: &Document) -> Uncertainty {
    let mut params = Vec::new();
    let mut all_keys: Vec<(String, String)> = Vec::new();
    for (i, u) in raw.iter().enumerate() {
        let k = |f: &str| format!("uncertain[{i}].{f}");
        if u.name.trim().is_empty() || raw[..i].iter().any(|o| o.name == u.name) {
            c.bad(
                &k("name"),
                format!("= \"{}\" must be a non-empty name used by no other [[uncertain]] entry", u.name),
            );
        }
        if u.keys.is_empty() {
            c.bad(&k("keys"), "is empty; list the key paths this factor multiplies".into());
        }
        for (j, key) in u.keys.iter().enumerate() {
            let at = format!("uncertain[{i}].keys[{j}]");
            if all_keys.iter().any(|(_, o)| o == key) {
                c.bad(&at, format!("= \"{key}\" is already given an uncertainty; each key may have one"));
            }
            all_keys.push((at, key.clone()));
        }
        let distribution = distribution(c, i, u);
        params.push(Uncertain { name: u.name.clone(), keys: u.keys.clone(), distribution });
    }
    c.issues.extend(doc.check_numeric_keys(&all_keys, c.lines));
    let u = Uncertainty { params, correlations: correlations(c, raw, corr) };
    if c.issues.is_empty() && crate::random::correlation_factor(&u).is_none() {
        c.bad(
            "correlation",
            "the coefficients together are not a valid correlation matrix (not positive definite); weaken some of them"
                .into(),
        );
    }
    u
}

/// The distribution of entry `i`: its name and the parameters it needs.
fn distribution(c: &mut Check, i: usize, u: &RawUncertain) -> Distribution {
    let k = |f: &str| format!("uncertain[{i}].{f}");
    let cov = |c: &mut Check, high: f64| match u.cov {
        Some(v) => c.num(&k("cov"), v, Low::Incl(0.0), high),
        None => {
            c.bad(&k("cov"), format!("is missing; distribution = \"{}\" needs it", u.distribution));
            0.0
        }
    };
    let no_range = |c: &mut Check| {
        for (f, v) in [("low", u.low), ("high", u.high)] {
            if v.is_some() {
                c.bad(&k(f), "only applies with distribution = \"uniform\"".into());
            }
        }
    };
    match c.choice(&k("distribution"), Some(&u.distribution), &["lognormal", "normal", "uniform"]) {
        "lognormal" => {
            no_range(c);
            Distribution::Lognormal { cov: cov(c, 2.0) }
        }
        "normal" => {
            no_range(c);
            Distribution::Normal { cov: cov(c, 0.5) }
        }
        _ => {
            if u.cov.is_some() {
                c.bad(&k("cov"), "does not apply with distribution = \"uniform\"; give low and high".into());
            }
            let mut end = |f: &str, v: Option<f64>| match v {
                Some(x) => c.num(&k(f), x, Low::Excl(0.0), 10.0),
                None => {
                    c.bad(&k(f), "is missing; distribution = \"uniform\" needs low and high (factors)".into());
                    1.0
                }
            };
            let (low, high) = (end("low", u.low), end("high", u.high));
            if low >= high {
                c.bad(&k("high"), format!("= {high} must be greater than low = {low}"));
            }
            Distribution::Uniform { low, high }
        }
    }
}

/// The correlations, by index into the entries.
fn correlations(c: &mut Check, raw: &[RawUncertain], corr: &[RawCorrelation]) -> Vec<Correlation> {
    let mut out: Vec<Correlation> = Vec::new();
    for (i, r) in corr.iter().enumerate() {
        let k = |f: &str| format!("correlation[{i}].{f}");
        let index = |name: &String| raw.iter().position(|u| &u.name == name);
        let pair = match &r.between[..] {
            [a, b] if a != b => match (index(a), index(b)) {
                (Some(a), Some(b)) => Some((a, b)),
                _ => {
                    let names: Vec<&str> = raw.iter().map(|u| u.name.as_str()).collect();
                    c.bad(
                        &k("between"),
                        format!("names an unknown [[uncertain]] entry; the names are: {}", names.join(", ")),
                    );
                    None
                }
            },
            _ => {
                c.bad(&k("between"), "must name two different [[uncertain]] entries".into());
                None
            }
        };
        let rho = c.num(&k("coefficient"), r.coefficient, Low::Incl(-0.99), 0.99);
        if let Some((a, b)) = pair {
            if out.iter().any(|o| (o.a, o.b) == (a, b) || (o.a, o.b) == (b, a)) {
                c.bad(&k("between"), "repeats a pair already correlated".into());
            }
            out.push(Correlation { a, b, coefficient: rho });
        }
    }
    out
}
