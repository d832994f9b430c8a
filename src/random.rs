//! Random numbers and the statistics around them: a seeded generator
//! (SplitMix64, Steele, Lea & Flood 2014) with Box–Muller normals, the
//! standard normal distribution function and its inverse, correlated factors
//! for Monte Carlo (Gaussian copula through a Cholesky factor), and sample
//! percentiles.

use crate::model::{Distribution, NORMAL_FLOOR, Uncertainty};
use nalgebra::DMatrix;

/// A seeded generator of uniform and normal numbers.
pub struct Noise(u64);

impl Noise {
    pub fn new(seed: u64) -> Noise {
        Noise(seed)
    }

    /// A generator for stream `index` of master seed `seed`: the pair is
    /// mixed through the SplitMix64 finaliser, so streams start far apart
    /// and each depends only on (seed, index), never on thread scheduling.
    pub fn stream(seed: u64, index: u64) -> Noise {
        let mut g = Noise(seed ^ index.wrapping_mul(0xD1B5_4A32_D192_ED03));
        Noise(g.next_u64())
    }

    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in (0, 1).
    pub fn uniform(&mut self) -> f64 {
        ((self.next_u64() >> 11) as f64 + 0.5) / (1u64 << 53) as f64
    }

    /// Standard normal (Box–Muller).
    pub fn normal(&mut self) -> f64 {
        let (a, b) = (self.uniform(), self.uniform());
        (-2.0 * a.ln()).sqrt() * (std::f64::consts::TAU * b).cos()
    }
}

/// Complementary error function, fractional error below 1.2e-7 everywhere
/// (Chebyshev fit `erfcc`, Press et al., Numerical Recipes, 2nd ed., §6.2).
pub fn erfc(x: f64) -> f64 {
    let z = x.abs();
    let t = 1.0 / (1.0 + 0.5 * z);
    let poly = -z * z - 1.265_512_23
        + t * (1.000_023_68
            + t * (0.374_091_96
                + t * (0.096_784_18
                    + t * (-0.186_288_06
                        + t * (0.278_868_07
                            + t * (-1.135_203_98 + t * (1.488_515_87 + t * (-0.822_152_23 + t * 0.170_872_77))))))));
    let r = t * poly.exp();
    if x >= 0.0 { r } else { 2.0 - r }
}

/// Standard normal distribution function Φ(x) = ½ erfc(−x/√2).
pub fn normal_cdf(x: f64) -> f64 {
    0.5 * erfc(-x / std::f64::consts::SQRT_2)
}

/// Inverse of Φ for 0 < p < 1: Newton's method on Φ(z) − p from z = 0,
/// kept inside a bisection bracket [−9, 9] so it cannot diverge.
pub fn normal_quantile(p: f64) -> f64 {
    let (mut lo, mut hi) = (-9.0f64, 9.0f64);
    let mut z = 0.0;
    for _ in 0..100 {
        let f = normal_cdf(z) - p;
        if f > 0.0 {
            hi = z
        } else {
            lo = z
        }
        let density = (-0.5 * z * z).exp() / (std::f64::consts::TAU).sqrt();
        let mut next = z - f / density.max(1e-300);
        if !(next > lo && next < hi) {
            next = 0.5 * (lo + hi);
        }
        if (next - z).abs() < 1e-10 {
            return next;
        }
        z = next;
    }
    z
}

/// Lower Cholesky factor of the correlation matrix of the declared factors,
/// or None when it is not positive definite.
pub fn correlation_factor(u: &Uncertainty) -> Option<DMatrix<f64>> {
    let n = u.params.len();
    let mut m = DMatrix::<f64>::identity(n, n);
    for c in &u.correlations {
        m[(c.a, c.b)] = c.coefficient;
        m[(c.b, c.a)] = c.coefficient;
    }
    if n == 0 {
        return Some(m);
    }
    nalgebra::Cholesky::new(m).map(|c| c.l())
}

/// Parameters (μ, σ) of ln X for a lognormal X with mean 1 and coefficient
/// of variation `cov`: σ² = ln(1 + cov²), μ = −σ²/2.
pub fn lognormal_params(cov: f64) -> (f64, f64) {
    let s2 = (1.0 + cov * cov).ln();
    (-0.5 * s2, s2.sqrt())
}

/// The factor of a distribution at standard normal value `z`.
pub fn factor(d: Distribution, z: f64) -> f64 {
    match d {
        Distribution::Lognormal { cov } => {
            let (mu, sigma) = lognormal_params(cov);
            (mu + sigma * z).exp()
        }
        Distribution::Normal { cov: 0.0 } => 1.0,
        Distribution::Normal { cov } => {
            // Truncated normal by inverse transform: the copula's Φ(z) is
            // spread over the part of the distribution above the floor.
            let below = normal_cdf((NORMAL_FLOOR - 1.0) / cov);
            let p = below + normal_cdf(z) * (1.0 - below);
            1.0 + cov * normal_quantile(p)
        }
        Distribution::Uniform { low, high } => low + (high - low) * normal_cdf(z),
    }
}

/// One draw of every declared factor: independent standard normals,
/// correlated by `l` (the Cholesky factor), mapped through each marginal.
pub fn draw(u: &Uncertainty, l: &DMatrix<f64>, rng: &mut Noise) -> Vec<f64> {
    let n = u.params.len();
    let e: Vec<f64> = (0..n).map(|_| rng.normal()).collect();
    (0..n)
        .map(|i| {
            let z: f64 = (0..=i).map(|j| l[(i, j)] * e[j]).sum();
            factor(u.params[i].distribution, z)
        })
        .collect()
}

/// Sample percentiles `qs` (each 0–100) of `v` by linear interpolation
/// between order statistics (Hyndman & Fan 1996, definition 7; the default
/// of numpy.percentile and R's quantile). `v` need not be sorted; it is
/// sorted once for all of them. NaN for an empty sample.
pub fn percentiles<const N: usize>(v: &[f64], qs: [f64; N]) -> [f64; N] {
    let mut s = v.to_vec();
    s.sort_by(f64::total_cmp);
    qs.map(|q| {
        if s.is_empty() {
            return f64::NAN;
        }
        let h = (s.len() - 1) as f64 * q / 100.0;
        let (lo, frac) = (h.floor() as usize, h - h.floor());
        if lo + 1 < s.len() { s[lo] + frac * (s[lo + 1] - s[lo]) } else { s[lo] }
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Correlation, Uncertain};

    #[test]
    fn normal_cdf_matches_the_table() {
        // Standard normal table values (e.g. Abramowitz & Stegun 1964,
        // Table 26.1): Φ(1) = 0.8413447, Φ(1.96) = 0.9750021, Φ(−3) = 0.0013499.
        assert!((normal_cdf(1.0) - 0.841_344_7).abs() < 2e-7);
        assert!((normal_cdf(1.96) - 0.975_002_1).abs() < 2e-7);
        assert!((normal_cdf(-3.0) - 0.001_349_9).abs() < 1e-7);
        assert!((normal_cdf(0.0) - 0.5).abs() < 1e-7);
    }

    #[test]
    fn quantile_matches_published_percentage_points() {
        // Percentage points of the standard normal, published (Abramowitz &
        // Stegun 1964, Table 26.5, six decimals; the same values come from
        // Wichura's 1988 algorithm AS 241, an independent method). The
        // tolerance 2e-6 covers the table's rounding and erfc's 1.2e-7.
        for (p, z) in [
            (0.975, 1.959_964),
            (0.9, 1.281_552),
            (0.99, 2.326_348),
            (0.999, 3.090_232),
            (0.8, 0.841_621),
            (0.3, -0.524_401),
            (0.5, 0.0),
            (1e-6, -4.753_424),
        ] {
            let q = normal_quantile(p);
            assert!((q - z).abs() < 2e-6 * z.abs().max(1.0), "Φ⁻¹({p}) = {q}, table {z}");
        }
    }

    #[test]
    fn lognormal_factor_has_mean_one_and_the_stated_cov() {
        // Sample moments of 200,000 draws; the standard error of the mean is
        // cov/√n ≈ 0.0011 and of the CoV about 0.003 (general statistics).
        let mut g = Noise::new(7);
        let d = Distribution::Lognormal { cov: 0.5 };
        let x: Vec<f64> = (0..200_000).map(|_| factor(d, g.normal())).collect();
        let mean = x.iter().sum::<f64>() / x.len() as f64;
        let var = x.iter().map(|v| (v - mean).powi(2)).sum::<f64>() / (x.len() - 1) as f64;
        assert!((mean - 1.0).abs() < 0.005, "{mean}");
        assert!((var.sqrt() / mean - 0.5).abs() < 0.015, "{}", var.sqrt() / mean);
    }

    #[test]
    fn truncated_normal_stays_above_the_floor() {
        let mut g = Noise::new(3);
        let d = Distribution::Normal { cov: 0.5 };
        assert!((0..20_000).all(|_| factor(d, g.normal()) >= NORMAL_FLOOR - 1e-9));
        assert_eq!(factor(Distribution::Normal { cov: 0.0 }, 1.3), 1.0);
    }

    #[test]
    fn correlated_draws_have_the_stated_correlation() {
        let p = |name: &str| Uncertain {
            name: name.into(),
            keys: vec![],
            distribution: Distribution::Uniform { low: 0.0 + 1e-9, high: 1.0 },
        };
        let u = Uncertainty {
            params: vec![p("a"), p("b")],
            correlations: vec![Correlation { a: 0, b: 1, coefficient: 0.7 }],
        };
        let l = correlation_factor(&u).unwrap();
        let mut g = Noise::new(11);
        // Uniform marginals of a Gaussian copula with ρ = 0.7 have rank
        // correlation (6/π) asin(ρ/2) = 0.6829 (Pearson 1907; Kruskal 1958).
        let n = 50_000;
        let draws: Vec<Vec<f64>> = (0..n).map(|_| draw(&u, &l, &mut g)).collect();
        let m = |k: usize| draws.iter().map(|d| d[k]).sum::<f64>() / n as f64;
        let (ma, mb) = (m(0), m(1));
        let cov: f64 = draws.iter().map(|d| (d[0] - ma) * (d[1] - mb)).sum::<f64>() / n as f64;
        let rho_s = cov / (1.0 / 12.0);
        assert!((rho_s - 0.6829).abs() < 0.01, "{rho_s}");
        let bad = Uncertainty {
            params: vec![p("a"), p("b"), p("c")],
            correlations: vec![
                Correlation { a: 0, b: 1, coefficient: 0.9 },
                Correlation { a: 1, b: 2, coefficient: 0.9 },
                Correlation { a: 0, b: 2, coefficient: -0.9 },
            ],
        };
        assert!(correlation_factor(&bad).is_none());
    }

    #[test]
    fn percentiles_follow_definition_7() {
        // numpy.percentile([1, 2, 3, 4], [10, 50, 90]) = [1.3, 2.5, 3.7].
        let v = [4.0, 1.0, 3.0, 2.0];
        let [p10, p50, p90] = percentiles(&v, [10.0, 50.0, 90.0]);
        assert!((p10 - 1.3).abs() < 1e-12);
        assert!((p50 - 2.5).abs() < 1e-12);
        assert!((p90 - 3.7).abs() < 1e-12);
    }

    #[test]
    fn generator_gives_the_published_splitmix64_sequence() {
        // Published reference outputs of SplitMix64 (Steele, Lea & Flood
        // 2014; Vigna's reference splitmix64.c) for seed 1234567, as listed
        // on Rosetta Code, "Pseudo-random numbers/Splitmix64".
        let mut g = Noise::new(1_234_567);
        let expected = [
            6_457_827_717_110_365_317u64,
            3_203_168_211_198_807_973,
            9_817_491_932_198_370_423,
            4_593_380_528_125_082_431,
        ];
        for e in expected {
            assert_eq!(g.next_u64(), e);
        }
    }

    #[test]
    fn neighbouring_streams_are_uncorrelated() {
        // Streams (seed, k) and (seed, k + 1), and (seed, k) and (seed + 1,
        // k), must behave as independent: the sample correlation of n
        // uniform pairs has standard deviation 1/√n (general statistics);
        // 4/√n is never reached by chance in practice. A stream that
        // repeated or shifted another would give a correlation near 1.
        let n = 20_000;
        let corr = |mut a: Noise, mut b: Noise| {
            let (x, y): (Vec<f64>, Vec<f64>) = (0..n).map(|_| (a.uniform(), b.uniform())).unzip();
            let (mx, my) = (x.iter().sum::<f64>() / n as f64, y.iter().sum::<f64>() / n as f64);
            let sxy: f64 = x.iter().zip(&y).map(|(a, b)| (a - mx) * (b - my)).sum();
            let sxx: f64 = x.iter().map(|a| (a - mx).powi(2)).sum();
            let syy: f64 = y.iter().map(|b| (b - my).powi(2)).sum();
            sxy / (sxx * syy).sqrt()
        };
        let bound = 4.0 / (n as f64).sqrt();
        for (a, b) in [((1, 5), (1, 6)), ((1, 5), (2, 5)), ((0, 0), (0, 1))] {
            let r = corr(Noise::stream(a.0, a.1), Noise::stream(b.0, b.1));
            assert!(r.abs() < bound, "streams {a:?} and {b:?}: correlation {r}");
        }
        // One stream one step behind the other (lag 1) is also uncorrelated.
        let mut lag = Noise::stream(1, 5);
        lag.uniform();
        let r = corr(Noise::stream(1, 5), lag);
        assert!(r.abs() < bound, "lag-1 correlation {r}");
    }
}
