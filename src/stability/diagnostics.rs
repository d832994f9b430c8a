//! Counts of every non-physical value met and every fallback taken while
//! circles are analysed, so that none is silent: a negative effective
//! normal force on a frictional slice base is taken as zero (no friction
//! there; common practice), and a circle whose Bishop iteration fails (m_α
//! below `M_ALPHA_MIN` on a frictional slice, or no convergence) is
//! evaluated by the Ordinary method (Fellenius 1927) instead of being
//! dropped. The counts travel with each search result and are added up by
//! the commands that run many searches.

use super::{CircleResult, Method, Reject};
use serde::Serialize;

/// What happened to the trial circles of one or more searches.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Serialize)]
pub struct Diagnostics {
    /// Searches counted.
    pub searches: usize,
    /// Trial circles analysed.
    pub circles: usize,
    /// Circles with at least one slice base whose effective normal force
    /// was negative and was taken as zero.
    pub zero_normal_circles: usize,
    /// Circles evaluated by the Ordinary method because Bishop's m_α fell
    /// below `M_ALPHA_MIN` on a frictional slice.
    pub ordinary_small_m_alpha: usize,
    /// Circles evaluated by the Ordinary method because Bishop's iteration
    /// did not converge.
    pub ordinary_no_convergence: usize,
    /// Circles set aside because their mass would move away from the toe
    /// (the mirror-image circle on the other side is the one that counts).
    pub no_driving_moment: usize,
    /// Critical circles (one per search) that took a fallback or a clamp.
    pub critical_fallbacks: usize,
    /// Most slices any circle had (bounded by `Section::max_slices`).
    pub most_slices: usize,
}

impl Diagnostics {
    /// Count one trial circle's outcome.
    pub fn record(&mut self, r: &Result<CircleResult, Reject>) {
        self.circles += 1;
        match r {
            Ok(c) => {
                self.most_slices = self.most_slices.max(c.slices);
                self.zero_normal_circles += usize::from(c.zero_normal_slices > 0);
                match c.method {
                    Method::Bishop => {}
                    Method::OrdinarySmallMAlpha => self.ordinary_small_m_alpha += 1,
                    Method::OrdinaryNoConvergence => self.ordinary_no_convergence += 1,
                }
            }
            Err(Reject::NoDrivingMoment) => self.no_driving_moment += 1,
            Err(_) => {}
        }
    }

    /// Count the critical circle of a search.
    pub fn record_critical(&mut self, c: &CircleResult) {
        self.searches += 1;
        self.critical_fallbacks += usize::from(c.method != Method::Bishop || c.zero_normal_slices > 0);
    }

    /// Add the counts of another search.
    pub fn merge(&mut self, o: &Diagnostics) {
        self.searches += o.searches;
        self.circles += o.circles;
        self.zero_normal_circles += o.zero_normal_circles;
        self.ordinary_small_m_alpha += o.ordinary_small_m_alpha;
        self.ordinary_no_convergence += o.ordinary_no_convergence;
        self.no_driving_moment += o.no_driving_moment;
        self.critical_fallbacks += o.critical_fallbacks;
        self.most_slices = self.most_slices.max(o.most_slices);
    }

    /// One warning per kind of clamp or fallback that occurred.
    pub fn warnings(&self) -> Vec<String> {
        let of = |n: usize, what: &str| format!("slip circles: {n} of {} trial circles {what}", self.circles);
        let mut out = Vec::new();
        if self.zero_normal_circles > 0 {
            out.push(of(self.zero_normal_circles, "had a slice base with negative effective normal force (pore pressure above the overburden), taken as zero: no friction there"));
        }
        if self.ordinary_small_m_alpha > 0 {
            out.push(of(
                self.ordinary_small_m_alpha,
                "had Bishop's m_α below 0.2 on a frictional slice and were evaluated by the Ordinary method instead",
            ));
        }
        if self.ordinary_no_convergence > 0 {
            out.push(of(
                self.ordinary_no_convergence,
                "did not converge by Bishop's method and were evaluated by the Ordinary method instead",
            ));
        }
        if self.critical_fallbacks > 0 {
            out.push(format!(
                "slip circles: the critical circle of {} of {} searches is one of these; check it by hand",
                self.critical_fallbacks, self.searches
            ));
        }
        out
    }
}
