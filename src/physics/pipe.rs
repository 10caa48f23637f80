//! Pipe and hose friction (model.md M3, M4).
//!
//! Darcy friction factor f: 64/Re below Re = 2300; the Colebrook–White
//! equation above Re = 4000, solved by Newton's method from the Swamee–Jain
//! explicit estimate; a linear blend in Re between the two. Head loss of a
//! straight run with fittings: Δp = (f L/D + K) · ½ ρ V².

use std::f64::consts::PI;

/// Reynolds number below which flow is taken as laminar.
pub const RE_LAMINAR: f64 = 2300.0;
/// Reynolds number above which flow is taken as fully turbulent.
pub const RE_TURBULENT: f64 = 4000.0;

/// Swamee–Jain (1976) explicit approximation of the Colebrook friction factor.
pub fn swamee_jain(re: f64, relative_roughness: f64) -> f64 {
    let arg = relative_roughness / 3.7 + 5.74 / re.powf(0.9);
    0.25 / arg.log10().powi(2)
}

/// Colebrook–White (1939) friction factor, solved to machine precision.
///
/// Solves 1/√f = −2 log₁₀(ε/(3.7 D) + 2.51/(Re √f)) for x = 1/√f by Newton's
/// method, starting from Swamee–Jain; three to four steps are enough.
pub fn colebrook(re: f64, relative_roughness: f64) -> f64 {
    let a = relative_roughness / 3.7;
    let b = 2.51 / re;
    let mut x = 1.0 / swamee_jain(re, relative_roughness).sqrt();
    let ln10 = std::f64::consts::LN_10;
    for _ in 0..8 {
        let inner = a + b * x;
        let g = x + 2.0 * inner.log10();
        let dg = 1.0 + 2.0 * b / (inner * ln10);
        let step = g / dg;
        x -= step;
        // Newton converges quadratically: once a step is below 1e-8 of x,
        // the remaining error is below 1e-16 of x.
        if step.abs() < 1e-8 * x.abs() {
            break;
        }
    }
    1.0 / (x * x)
}

/// Darcy friction factor over the whole range of Reynolds number.
///
/// Returns 0 for Re ≤ 0 (no flow, no friction).
pub fn darcy_friction_factor(re: f64, relative_roughness: f64) -> f64 {
    friction_factor_with_slope(re, relative_roughness).0
}

/// Darcy friction factor and its derivative with respect to Re.
///
/// The Colebrook derivative comes from implicit differentiation of
/// g(x, Re) = x + 2 log₁₀(ε/(3.7D) + 2.51 x/Re) = 0 with x = 1/√f.
pub fn friction_factor_with_slope(re: f64, relative_roughness: f64) -> (f64, f64) {
    if re <= 0.0 {
        (0.0, 0.0)
    } else if re < RE_LAMINAR {
        (64.0 / re, -64.0 / (re * re))
    } else if re > RE_TURBULENT {
        let f = colebrook(re, relative_roughness);
        let x = 1.0 / f.sqrt();
        let (a, b) = (relative_roughness / 3.7, 2.51 / re);
        let inner = (a + b * x) * std::f64::consts::LN_10;
        let dx_dre = (2.0 * x * b / (re * inner)) / (1.0 + 2.0 * b / inner);
        (f, -2.0 * f * dx_dre / x)
    } else {
        let lam = 64.0 / RE_LAMINAR;
        let turb = colebrook(RE_TURBULENT, relative_roughness);
        let slope = (turb - lam) / (RE_TURBULENT - RE_LAMINAR);
        (lam + (re - RE_LAMINAR) * slope, slope)
    }
}

/// A round duct carrying water: its geometry and loss coefficients.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Duct {
    /// Bore, m.
    pub bore_m: f64,
    /// Length, m.
    pub length_m: f64,
    /// Absolute roughness, m.
    pub roughness_m: f64,
    /// Sum of minor-loss coefficients, velocity heads.
    pub minor_k: f64,
}

impl Duct {
    /// Flow area, m².
    pub fn area_m2(&self) -> f64 {
        PI * self.bore_m * self.bore_m / 4.0
    }

    /// Pressure loss at volumetric flow `q_m3_s` (≥ 0), Pa.
    ///
    /// `density` in kg/m³, `viscosity` in Pa·s.
    pub fn loss_pa(&self, q_m3_s: f64, density: f64, viscosity: f64) -> f64 {
        self.loss_with_slope(q_m3_s, density, viscosity).0
    }

    /// Pressure loss, Pa, and its derivative with respect to flow, Pa·s/m³.
    pub fn loss_with_slope(&self, q_m3_s: f64, density: f64, viscosity: f64) -> (f64, f64) {
        if q_m3_s <= 0.0 {
            return (0.0, 0.0);
        }
        let area = self.area_m2();
        let v = q_m3_s / area;
        let re_per_q = density * self.bore_m / (viscosity * area);
        let (f, df_dre) =
            friction_factor_with_slope(re_per_q * q_m3_s, self.roughness_m / self.bore_m);
        let l_over_d = self.length_m / self.bore_m;
        let head = 0.5 * density * v * v;
        let loss = (f * l_over_d + self.minor_k) * head;
        let slope = df_dre * re_per_q * l_over_d * head
            + (f * l_over_d + self.minor_k) * density * v / area;
        (loss, slope)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn colebrook_satisfies_its_own_equation() {
        for &(re, rr) in &[(5e3, 0.0), (1e5, 1e-4), (1e7, 1e-2)] {
            let f: f64 = colebrook(re, rr);
            let lhs = 1.0 / f.sqrt();
            let rhs = -2.0 * (rr / 3.7 + 2.51 / (re * f.sqrt())).log10();
            assert!((lhs - rhs).abs() < 1e-12 * lhs);
        }
    }

    #[test]
    fn loss_slope_matches_a_central_difference() {
        let duct = Duct {
            bore_m: 6e-3,
            length_m: 0.3,
            roughness_m: 1.5e-6,
            minor_k: 0.7,
        };
        // Laminar, blend and turbulent flows in a 6 mm bore.
        for &q in &[5e-6, 1.5e-5, 1e-4, 1e-3] {
            let (_, slope) = duct.loss_with_slope(q, 998.0, 1e-3);
            let h = 1e-6 * q;
            let fd =
                (duct.loss_pa(q + h, 998.0, 1e-3) - duct.loss_pa(q - h, 998.0, 1e-3)) / (2.0 * h);
            assert!(
                (slope - fd).abs() < 1e-5 * fd.abs(),
                "q {q}: {slope} vs {fd}"
            );
        }
    }

    #[test]
    fn friction_factor_is_continuous_at_the_blend_edges() {
        let below = darcy_friction_factor(RE_LAMINAR * (1.0 - 1e-12), 1e-4);
        let above = darcy_friction_factor(RE_LAMINAR * (1.0 + 1e-12), 1e-4);
        assert!((below - above).abs() < 1e-9);
        let below = darcy_friction_factor(RE_TURBULENT * (1.0 - 1e-12), 1e-4);
        let above = darcy_friction_factor(RE_TURBULENT * (1.0 + 1e-12), 1e-4);
        assert!((below - above).abs() < 1e-9);
    }
}
