//! Nozzle, arm and supply hydraulics in the rotating frame (model.md M3, M4).
//!
//! For nozzle i at radius Rᵢ, fed from the hub through its own arm tube:
//!
//! ```text
//! Δp_nozzle,i = p_hub + ½ρω²Rᵢ² − ρgΔzᵢ − Δp_arm,i(Qᵢ)
//! Qᵢ = C_d · (π dᵢ²/4) · √(2 Δp_nozzle,i / ρ)
//! Wᵢ = C_v · √(2 Δp_nozzle,i / ρ)
//! ```
//!
//! ½ρω²R² is the centrifugal pressure rise of the water turning with the arm.
//! The supply (fixed inlet pressure, fixed total flow, or a source through a
//! hose) is solved afresh at every ω, so flows, hub pressure and jet speeds are
//! all functions of ω. Pressures are gauge, Pa; flows m³/s.
//!
//! Both the per-nozzle flow and the hub pressure are found by a safeguarded
//! Newton iteration inside a bracket that is known to hold the root
//! ([`crate::numeric::newton`]), so each solve is robust (bisection when
//! Newton leaves the bracket) and cheap (two to four steps from a good
//! start). The functions are monotone, so the root is unique.

use std::f64::consts::PI;

use super::design::{Arm, Design, Line, Supply, GRAVITY_M_S2};
use super::fluid::{AirProps, WaterProps};
use super::pipe::Duct;
use crate::numeric::newton::bracketed_newton;

/// Water and air properties for one design.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Fluids {
    /// Water at the design's water temperature.
    pub water: WaterProps,
    /// Air at the design's site.
    pub air: AirProps,
}

impl Fluids {
    /// Properties for a design's water temperature and site.
    pub fn for_design(design: &Design) -> Self {
        Fluids {
            water: WaterProps::at(design.water_temperature_c),
            air: AirProps::at(design.site.air_temperature_c, design.site.altitude_m),
        }
    }
}

/// The state of one nozzle at one speed and hub pressure.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NozzleFlow {
    /// Volumetric flow, m³/s (0 when not flowing).
    pub flow_m3_s: f64,
    /// Pressure drop across the nozzle, Pa (what makes the jet; 0 when not flowing).
    pub nozzle_pressure_pa: f64,
    /// Friction and minor losses in the arm tube, Pa.
    pub arm_loss_pa: f64,
    /// Centrifugal pressure rise ½ρω²R², Pa.
    pub centrifugal_rise_pa: f64,
    /// Jet speed relative to the arm, m/s.
    pub jet_speed_relative_m_s: f64,
    /// False when the pressure available at the nozzle is zero or less.
    pub flowing: bool,
    /// dQ/dp_hub at this state, m³/(s·Pa) (used by the supply solve).
    pub dflow_dpressure: f64,
}

/// The whole water path at one rotor speed.
#[derive(Debug, Clone, PartialEq)]
pub struct SupplyState {
    /// Rotor speed, rad/s.
    pub omega_rad_s: f64,
    /// Gauge pressure at the sprinkler inlet (after any hose), Pa.
    pub inlet_pressure_pa: f64,
    /// Gauge pressure in the hub, after the swivel, Pa.
    pub hub_pressure_pa: f64,
    /// Total flow through the sprinkler, m³/s.
    pub total_flow_m3_s: f64,
    /// Loss in the hose (Line supply), Pa; 0 otherwise.
    pub line_loss_pa: f64,
    /// Loss in the swivel, Pa.
    pub swivel_loss_pa: f64,
    /// One entry per arm, in arm order.
    pub nozzles: Vec<NozzleFlow>,
}

/// Flow-independent terms of one nozzle's energy balance.
#[derive(Debug, Clone, Copy)]
struct NozzleCoeffs {
    /// ½ρ/(C_d A)²: Δp_nozzle = a·Q², Pa·s²/m⁶.
    a: f64,
    /// ½ρω²R² − ρgΔz, Pa.
    head_gain_pa: f64,
    /// Centrifugal rise alone, Pa.
    rise_pa: f64,
    cv: f64,
    tube: Duct,
}

impl NozzleCoeffs {
    /// The state of this nozzle when it passes no water.
    fn idle(&self) -> NozzleFlow {
        NozzleFlow {
            flow_m3_s: 0.0,
            nozzle_pressure_pa: 0.0,
            arm_loss_pa: 0.0,
            centrifugal_rise_pa: self.rise_pa,
            jet_speed_relative_m_s: 0.0,
            flowing: false,
            dflow_dpressure: 0.0,
        }
    }

    /// The state of this nozzle passing `q` m³/s with `available` Pa ahead of
    /// it, `arm_loss` Pa lost in the arm and `slope` = d(a·Q² + Δp_arm)/dQ.
    fn flowing(&self, q: f64, available: f64, arm_loss: f64, slope: f64, rho: f64) -> NozzleFlow {
        let dp_nozzle = (self.a * q * q).min(available);
        NozzleFlow {
            flow_m3_s: q,
            nozzle_pressure_pa: dp_nozzle,
            arm_loss_pa: arm_loss.max(0.0),
            centrifugal_rise_pa: self.rise_pa,
            jet_speed_relative_m_s: self.cv * (2.0 * dp_nozzle / rho).sqrt(),
            flowing: true,
            dflow_dpressure: if slope > 0.0 { 1.0 / slope } else { 0.0 },
        }
    }
}

fn nozzle_coeffs(arm: &Arm, omega: f64, water: &WaterProps) -> NozzleCoeffs {
    let rho = water.density_kg_m3;
    let area = PI * arm.nozzle.diameter_m.powi(2) / 4.0;
    let cd_area = arm.nozzle.cd * area;
    let rise = 0.5 * rho * omega * omega * arm.radius_m * arm.radius_m;
    NozzleCoeffs {
        a: 0.5 * rho / (cd_area * cd_area),
        head_gain_pa: rise - rho * GRAVITY_M_S2 * arm.rise_m,
        rise_pa: rise,
        cv: arm.nozzle.cv,
        tube: Duct {
            bore_m: arm.tube.bore_m,
            length_m: arm.tube_length_m(),
            roughness_m: arm.tube.roughness_m,
            minor_k: arm.tube.minor_k,
        },
    }
}

/// Highest pressure across a nozzle the model is meant for, Pa (2 MPa, about
/// 290 psi: well above any irrigation sprinkler's, common practice; the drop
/// and jet relations were fitted at 150–450 kPa).
pub const MAX_NOZZLE_PRESSURE_PA: f64 = 2.0e6;

/// Pressure across the nozzles that a fixed total flow `total_m3_s` needs at
/// the least, Pa: Δp = ρ/2 · (Q / Σ C_d A)², every nozzle at the same
/// pressure with the rotor held still and no losses (arm losses and the
/// centrifugal rise of a turning rotor only add to it). `None` when the
/// nozzles have no open area.
pub fn least_nozzle_pressure_for_flow_pa(
    arms: &[Arm],
    total_m3_s: f64,
    water_density_kg_m3: f64,
) -> Option<f64> {
    let open: f64 = arms
        .iter()
        .map(|a| a.nozzle.cd * PI * a.nozzle.diameter_m.powi(2) / 4.0)
        .sum();
    (open > 0.0 && open.is_finite())
        .then(|| 0.5 * water_density_kg_m3 * (total_m3_s / open).powi(2))
}

/// Flow through one nozzle for a given hub gauge pressure and speed.
///
/// Solves a·Q² + Δp_arm(Q) = p_hub + ½ρω²R² − ρgΔz for Q ≥ 0.
pub fn nozzle_flow(
    arm: &Arm,
    hub_pressure_pa: f64,
    omega_rad_s: f64,
    water: &WaterProps,
) -> NozzleFlow {
    let c = nozzle_coeffs(arm, omega_rad_s, water);
    solve_nozzle(&c, hub_pressure_pa, water, None)
}

fn solve_nozzle(
    c: &NozzleCoeffs,
    p_hub: f64,
    water: &WaterProps,
    guess: Option<f64>,
) -> NozzleFlow {
    let rho = water.density_kg_m3;
    let mu = water.viscosity_pa_s;
    let available = p_hub + c.head_gain_pa;
    if available <= 0.0 {
        return c.idle();
    }
    let q_max = (available / c.a).sqrt();
    // Residual and exact slope of a·Q² + Δp_arm(Q) − available.
    let residual = |q: f64| {
        let (arm, arm_slope) = c.tube.loss_with_slope(q, rho, mu);
        (c.a * q * q + arm - available, 2.0 * c.a * q + arm_slope)
    };
    let start = match guess {
        Some(g) if g > 0.0 && g < q_max => g,
        _ => {
            let k = c.tube.loss_pa(q_max, rho, mu) / (q_max * q_max);
            (available / (c.a + k)).sqrt()
        }
    };
    let (q, value, slope) = bracketed_newton(
        residual,
        0.0,
        q_max,
        start,
        1e-15 * q_max,
        1e-14 * available,
    );
    let arm_loss = value + available - c.a * q * q;
    c.flowing(q, available, arm_loss, slope, rho)
}

/// The hose of a Line supply as a duct.
fn line_duct(line: &Line) -> Duct {
    Duct {
        bore_m: line.bore_m,
        length_m: line.length_m,
        roughness_m: line.roughness_m,
        minor_k: line.minor_k,
    }
}

/// Every nozzle of a design at one speed, solved in place for a trial hub pressure.
struct NozzleSet<'a> {
    coeffs: Vec<NozzleCoeffs>,
    flows: Vec<NozzleFlow>,
    water: &'a WaterProps,
    warm: Option<WarmStart>,
}

/// A nearby solution to start the joint Newton iteration from.
#[derive(Debug, Clone)]
struct WarmStart {
    hub_pressure_pa: f64,
    flows: Vec<f64>,
}

impl NozzleSet<'_> {
    /// Solve every nozzle at hub pressure `p_hub`; returns (ΣQ, dΣQ/dp).
    /// The previous flows are the starting guesses.
    fn at(&mut self, p_hub: f64) -> (f64, f64) {
        let (mut total, mut slope) = (0.0, 0.0);
        for (c, flow) in self.coeffs.iter().zip(self.flows.iter_mut()) {
            *flow = solve_nozzle(c, p_hub, self.water, Some(flow.flow_m3_s));
            total += flow.flow_m3_s;
            slope += flow.dflow_dpressure;
        }
        (total, slope)
    }

    /// Newton's method on all unknowns at once (hub pressure and every
    /// nozzle's flow), closed by `closing(p, ΣQ) = (r₀, ∂r₀/∂p, ∂r₀/∂ΣQ)`.
    ///
    /// The Jacobian is arrow-shaped, so each step costs one loss evaluation
    /// per nozzle. Returns the hub pressure, or `None` when a nozzle stops
    /// flowing on the way or the iteration does not settle, so that the
    /// caller can fall back to the nested, bracketed solve.
    fn joint_newton(
        &mut self,
        p_start: f64,
        p_scale: f64,
        closing: impl Fn(f64, f64) -> (f64, f64, f64),
    ) -> Option<f64> {
        let (rho, mu) = (self.water.density_kg_m3, self.water.viscosity_pa_s);
        let mut p = p_start;
        // A warm start (a nearby state's hub pressure and flows) when one was
        // given and every nozzle flows there; otherwise the loss-free flows.
        let warm = self.warm.take().filter(|w| {
            w.flows.len() == self.coeffs.len()
                && w.flows.iter().all(|&q| q > 0.0)
                && self
                    .coeffs
                    .iter()
                    .all(|c| w.hub_pressure_pa + c.head_gain_pa > 0.0)
        });
        if let Some(w) = &warm {
            p = w.hub_pressure_pa;
            for (flow, &q) in self.flows.iter_mut().zip(&w.flows) {
                flow.flow_m3_s = q;
            }
        } else {
            for (c, flow) in self.coeffs.iter().zip(self.flows.iter_mut()) {
                let available = p + c.head_gain_pa;
                if available <= 0.0 {
                    return None;
                }
                flow.flow_m3_s = (available / c.a).sqrt();
            }
        }
        let n = self.coeffs.len();
        let mut residual = vec![0.0; n];
        let mut slope = vec![0.0; n];
        for _ in 0..40 {
            let mut total = 0.0;
            for (((c, flow), r), d) in self
                .coeffs
                .iter()
                .zip(&self.flows)
                .zip(residual.iter_mut())
                .zip(slope.iter_mut())
            {
                let q = flow.flow_m3_s;
                let (arm, arm_slope) = c.tube.loss_with_slope(q, rho, mu);
                *r = c.a * q * q + arm - (p + c.head_gain_pa);
                *d = 2.0 * c.a * q + arm_slope;
                total += q;
            }
            let (r0, dr0_dp, dr0_dq) = closing(p, total);
            let s1: f64 = slope.iter().map(|d| 1.0 / d).sum();
            let s2: f64 = residual.iter().zip(&slope).map(|(r, d)| r / d).sum();
            let dp = (-r0 + dr0_dq * s2) / (dr0_dp + dr0_dq * s1);
            if !dp.is_finite() {
                return None;
            }
            p += dp;
            let mut settled = dp.abs() <= 1e-10 * p_scale;
            for ((flow, r), d) in self.flows.iter_mut().zip(&residual).zip(&slope) {
                let dq = (dp - r) / d;
                flow.flow_m3_s += dq;
                if flow.flow_m3_s.is_nan() || flow.flow_m3_s <= 0.0 {
                    return None;
                }
                settled &= dq.abs() <= 1e-10 * flow.flow_m3_s;
            }
            if settled {
                for (c, flow) in self.coeffs.iter().zip(self.flows.iter_mut()) {
                    let q = flow.flow_m3_s;
                    let available = p + c.head_gain_pa;
                    let (arm, arm_slope) = c.tube.loss_with_slope(q, rho, mu);
                    if available <= 0.0 {
                        return None;
                    }
                    *flow = c.flowing(q, available, arm, 2.0 * c.a * q + arm_slope, rho);
                }
                return Some(p);
            }
        }
        None
    }

    /// The solved nozzles (every exit path of the solvers leaves each one
    /// freshly solved, idle ones included).
    fn finish(&mut self) -> Vec<NozzleFlow> {
        std::mem::take(&mut self.flows)
    }
}

/// Solve the water path of `design` at speed `omega_rad_s`.
pub fn supply_state(design: &Design, fluids: &Fluids, omega_rad_s: f64) -> SupplyState {
    supply_state_near(design, fluids, omega_rad_s, None)
}

/// [`supply_state`], starting the iteration from `near`, a solved state at a
/// nearby speed (the same answer to the solver's tolerance, in fewer steps).
pub fn supply_state_near(
    design: &Design,
    fluids: &Fluids,
    omega_rad_s: f64,
    near: Option<&SupplyState>,
) -> SupplyState {
    let water = &fluids.water;
    let (rho, mu) = (water.density_kg_m3, water.viscosity_pa_s);
    let coeffs: Vec<NozzleCoeffs> = design
        .rotor
        .arms
        .iter()
        .map(|arm| nozzle_coeffs(arm, omega_rad_s, water))
        .collect();
    // Below this hub pressure no nozzle flows.
    let p_dead = coeffs
        .iter()
        .map(|c| -c.head_gain_pa)
        .fold(f64::INFINITY, f64::min);
    let mut set = NozzleSet {
        flows: coeffs.iter().map(NozzleCoeffs::idle).collect(),
        coeffs,
        water,
        warm: near.map(|n| WarmStart {
            hub_pressure_pa: n.hub_pressure_pa,
            flows: n.nozzles.iter().map(|f| f.flow_m3_s).collect(),
        }),
    };
    let swivel_area = PI * design.rotor.swivel.inlet_bore_m.powi(2) / 4.0;
    let swivel_k = design.rotor.swivel.k * 0.5 * rho / (swivel_area * swivel_area);

    let (upstream_pa, line) = match design.supply {
        Supply::Pressure { inlet_pa } => (inlet_pa, None),
        Supply::Line(line) => (
            line.source_pa - rho * GRAVITY_M_S2 * line.lift_m,
            Some(line_duct(&line)),
        ),
        Supply::Flow { total_m3_s } => {
            return flow_supply(&mut set, omega_rad_s, total_m3_s, p_dead, swivel_k);
        }
    };
    // Hose loss, Pa, and its slope in Q.
    let hose_loss = |q: f64| line.map_or((0.0, 0.0), |d| d.loss_with_slope(q, rho, mu));

    let span = upstream_pa - p_dead;
    let closing = |p: f64, q: f64| {
        let (hose, dhose) = hose_loss(q);
        (
            p - upstream_pa + hose + swivel_k * q * q,
            1.0,
            dhose + 2.0 * swivel_k * q,
        )
    };
    let fast = (upstream_pa > p_dead)
        .then(|| set.joint_newton(upstream_pa, span, closing))
        .flatten();
    let p_hub = if let Some(p) = fast {
        p
    } else if upstream_pa <= p_dead {
        set.at(upstream_pa);
        upstream_pa
    } else {
        // H(p) = p − upstream + loss(Q(p)), increasing in p; H(p_dead) < 0 ≤ H(upstream).
        let (p, _, _) = bracketed_newton(
            |p| {
                let (q, dq) = set.at(p);
                let (hose, dhose) = hose_loss(q);
                let loss = hose + swivel_k * q * q;
                let dloss = dhose + 2.0 * swivel_k * q;
                (p - upstream_pa + loss, 1.0 + dloss * dq)
            },
            p_dead,
            upstream_pa,
            upstream_pa,
            1e-14 * span,
            1e-13 * span,
        );
        p
    };
    let total: f64 = set.flows.iter().map(|f| f.flow_m3_s).sum();
    let hose = hose_loss(total).0;
    SupplyState {
        omega_rad_s,
        inlet_pressure_pa: upstream_pa - hose,
        hub_pressure_pa: p_hub,
        total_flow_m3_s: total,
        line_loss_pa: hose,
        swivel_loss_pa: swivel_k * total * total,
        nozzles: set.finish(),
    }
}

/// Fixed total flow: find the hub pressure at which the nozzles pass it.
fn flow_supply(
    set: &mut NozzleSet<'_>,
    omega_rad_s: f64,
    total_m3_s: f64,
    p_dead: f64,
    swivel_k: f64,
) -> SupplyState {
    // Start above the dead pressure by the head the flow needs through all
    // nozzles at once, and double until the nozzles pass the flow.
    let cd_area: f64 = set
        .coeffs
        .iter()
        .map(|c| (0.5 * set.water.density_kg_m3 / c.a).sqrt())
        .sum();
    let mut step = (0.5 * set.water.density_kg_m3 * (total_m3_s / cd_area).powi(2)).max(1.0);
    let fast = set.joint_newton(p_dead + step, step, |_, q| (q - total_m3_s, 0.0, 1.0));
    if let Some(p_hub) = fast {
        return flow_state(set, omega_rad_s, p_hub, swivel_k);
    }
    let mut hi = p_dead + step;
    for _ in 0..200 {
        if set.at(hi).0 >= total_m3_s {
            break;
        }
        step *= 2.0;
        hi = p_dead + step;
    }
    let span = hi - p_dead;
    let (p_hub, _, _) = bracketed_newton(
        |p| {
            let (q, dq) = set.at(p);
            (q - total_m3_s, dq)
        },
        p_dead,
        hi,
        hi,
        1e-14 * span,
        1e-14 * total_m3_s,
    );
    flow_state(set, omega_rad_s, p_hub, swivel_k)
}

fn flow_state(set: &mut NozzleSet<'_>, omega_rad_s: f64, p_hub: f64, swivel_k: f64) -> SupplyState {
    let total: f64 = set.flows.iter().map(|f| f.flow_m3_s).sum();
    let swivel = swivel_k * total * total;
    SupplyState {
        omega_rad_s,
        inlet_pressure_pa: p_hub + swivel,
        hub_pressure_pa: p_hub,
        total_flow_m3_s: total,
        line_loss_pa: 0.0,
        swivel_loss_pa: swivel,
        nozzles: set.finish(),
    }
}
