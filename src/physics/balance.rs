//! Equilibrium, start, runaway, spin-up and power (model.md M6).
//!
//! net(ω) = T_drive(ω) − T_resist(ω), both in the drive sense convention of
//! [`super::torque`]. Every root of net on (0, ω_cap] is found by a scan on a
//! geometric grid followed by Brent's method on each sign change; a root is
//! stable when net falls through zero (d net/dω < 0). The operating point is
//! the lowest stable root, which is where a rotor that starts from rest settles.
//!
//! ω_cap is the higher of three times the frictionless runaway speed and the
//! speed at which the outermost nozzle moves at 150 m/s. The start check
//! compares the stall torque T_drive(0) with the breakaway torque (static
//! bearing friction plus seal drag at rest). Spin-up integrates I dω/dt = net(ω)
//! from rest by the classical fourth-order Runge–Kutta method.

use std::f64::consts::PI;

use super::design::{Design, Inertia};
use super::hydraulics::{supply_state_near, Fluids, SupplyState};
use super::jet::JetExit;
use super::torque::{
    drive_torque, jet_kinetic_power_w, jets, resisting_torque, Motion, ResistingTorque,
};
use crate::numeric::root::{brent, RootError, Tolerance};

mod spin_up;
mod table;

pub use spin_up::{spin_up_times, SpinUp, SPIN_UP_STEPS_PER_TIME_SCALE};
pub use table::{table_speeds, table_top_speed, torque_table, torque_table_to, TableRow};

/// Above this inlet pressure a regulator is called for, Pa (80 psi; common
/// practice: plumbing codes).
pub const REGULATOR_LIMIT_PA: f64 = 551_580.0;
/// Tip speed that bounds the equilibrium search, m/s.
pub const CAP_TIP_SPEED_M_S: f64 = 150.0;
/// Points in the geometric scan for sign changes of net torque (a 25 % step).
pub const SCAN_POINTS: usize = 42;
/// Lowest scan speed as a fraction of ω_cap (a root below it is still
/// bracketed between rest and the first grid point).
const SCAN_FLOOR: f64 = 1e-4;
/// Points and floor of the runaway scan (up to ten times the tip-speed cap, a 29 % step).
const RUNAWAY_POINTS: usize = 28;
const RUNAWAY_FLOOR: f64 = 1e-3;

/// rad/s → rpm.
pub fn rpm(omega_rad_s: f64) -> f64 {
    omega_rad_s * 60.0 / (2.0 * PI)
}

/// rpm → rad/s.
pub fn rad_s(rpm: f64) -> f64 {
    rpm * 2.0 * PI / 60.0
}

/// Drive, resisting and net torque at one speed, with the water path.
#[derive(Debug, Clone, PartialEq)]
pub struct TorquePoint {
    /// Rotor speed, rad/s.
    pub omega_rad_s: f64,
    /// Drive torque from the jets, N·m.
    pub drive_n_m: f64,
    /// Resisting torque by part, N·m.
    pub resist: ResistingTorque,
    /// Water path at this speed.
    pub state: SupplyState,
}

impl TorquePoint {
    /// Net accelerating torque, N·m.
    pub fn net_n_m(&self) -> f64 {
        self.drive_n_m - self.resist.total_n_m()
    }
}

/// A design with its fluid properties, ready to be evaluated at any speed.
#[derive(Debug, Clone)]
pub struct SpinModel<'a> {
    /// The design.
    pub design: &'a Design,
    /// Water and air at the design's conditions.
    pub fluids: Fluids,
    /// The last water path solved, the warm start for the next one (the
    /// scans, Brent and RK4 all ask for nearby speeds in turn).
    last: std::cell::RefCell<Option<SupplyState>>,
}

impl<'a> SpinModel<'a> {
    /// Prepare a design for evaluation.
    pub fn new(design: &'a Design) -> Self {
        SpinModel {
            design,
            fluids: Fluids::for_design(design),
            last: std::cell::RefCell::new(None),
        }
    }

    fn rho(&self) -> f64 {
        self.fluids.water.density_kg_m3
    }

    /// Water path at speed ω, rad/s.
    pub fn state(&self, omega_rad_s: f64) -> SupplyState {
        let near = self.last.borrow().clone();
        let state = supply_state_near(self.design, &self.fluids, omega_rad_s, near.as_ref());
        *self.last.borrow_mut() = Some(state.clone());
        state
    }

    /// Torques while turning at ω (kinetic friction), N·m.
    pub fn point(&self, omega_rad_s: f64) -> TorquePoint {
        let state = self.state(omega_rad_s);
        self.point_from(state, Motion::Turning)
    }

    fn point_from(&self, state: SupplyState, motion: Motion) -> TorquePoint {
        let drive = drive_torque(self.design, &state, self.rho());
        let resist = resisting_torque(self.design, &state, self.rho(), &self.fluids.air, motion);
        TorquePoint {
            omega_rad_s: state.omega_rad_s,
            drive_n_m: drive,
            resist,
            state,
        }
    }

    /// Net torque while turning at ω, N·m.
    pub fn net(&self, omega_rad_s: f64) -> f64 {
        self.point(omega_rad_s).net_n_m()
    }

    /// Drive torque alone at ω, N·m.
    pub fn drive(&self, omega_rad_s: f64) -> f64 {
        drive_torque(self.design, &self.state(omega_rad_s), self.rho())
    }

    /// Rotor inertia about the spin axis, kg·m².
    pub fn inertia_kg_m2(&self) -> f64 {
        rotor_inertia_kg_m2(self.design, self.rho())
    }
}

/// Rotor inertia, kg·m²: given, or estimated from the arm tubes as thin
/// rods from the hub radius to the tip, the water they hold, and tip masses.
pub fn rotor_inertia_kg_m2(design: &Design, water_density: f64) -> f64 {
    match design.rotor.inertia {
        Inertia::Given { kg_m2 } => kg_m2,
        Inertia::Estimate {
            tube_density_kg_m3,
            tube_wall_m,
            tip_mass_kg,
        } => {
            let hub = design.rotor.hub_radius_m;
            design
                .rotor
                .arms
                .iter()
                .map(|arm| {
                    let outer = arm.tube.outer_m;
                    let inner = (outer - 2.0 * tube_wall_m).max(0.0);
                    let wall_per_m =
                        tube_density_kg_m3 * PI / 4.0 * (outer * outer - inner * inner);
                    let water_per_m = water_density * PI / 4.0 * arm.tube.bore_m.powi(2);
                    let r3 = (arm.radius_m.powi(3) - hub.powi(3)).max(0.0) / 3.0;
                    (wall_per_m + water_per_m) * r3 + tip_mass_kg * arm.radius_m.powi(2)
                })
                .sum()
        }
    }
}

/// Where the rotor ends up, in words a report can use.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SpinStatus {
    /// It starts from rest and settles at the operating point.
    Running,
    /// Stall torque does not beat breakaway torque: it will not start alone.
    StallsAtRest,
    /// It starts but finds no stable speed below ω_cap.
    NoEquilibrium,
}

impl SpinStatus {
    /// The fixed key used in reports ("running", "stalls_at_rest", "no_equilibrium").
    pub fn key(&self) -> &'static str {
        match self {
            SpinStatus::Running => "running",
            SpinStatus::StallsAtRest => "stalls_at_rest",
            SpinStatus::NoEquilibrium => "no_equilibrium",
        }
    }
}

/// One root of net torque.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Equilibrium {
    /// Speed, rad/s.
    pub omega_rad_s: f64,
    /// True when net torque falls through zero here.
    pub stable: bool,
}

/// Power balance at the operating point, W.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PowerBalance {
    /// Shaft power T·ω, all of it ending as friction heat, W.
    pub shaft_w: f64,
    /// Hydraulic power delivered at the inlet, p_inlet·Q, W.
    pub hydraulic_w: f64,
    /// Kinetic power of the jets in the ground frame, W.
    pub jet_kinetic_w: f64,
}

/// Something the user should know about a result.
#[derive(Debug, Clone, PartialEq)]
pub enum Warning {
    /// A nozzle passes no water at the operating state (or at rest).
    NozzleNotFlowing {
        /// Arm index, from 0.
        arm: usize,
    },
    /// The hub pressure is below the water's vapour pressure: the arm would draw air or cavitate.
    HubBelowVapour {
        /// Hub gauge pressure, Pa.
        hub_pressure_pa: f64,
    },
    /// It will not start by itself but would keep turning if spun by hand.
    KeepsTurningOnceSpun,
    /// No stable speed below the search cap.
    NoEquilibriumBelow {
        /// The cap, rad/s.
        cap_rad_s: f64,
    },
    /// There are equilibria other than the operating point.
    OtherEquilibria {
        /// How many.
        count: usize,
    },
    /// Frictionless, it would never stop accelerating (fixed pressure, near-tangential jets).
    NoFiniteRunaway,
    /// Supply pressure above the usual 80 psi regulator limit (common practice).
    HighSupplyPressure {
        /// Gauge pressure at the inlet, Pa.
        pressure_pa: f64,
    },
    /// Static friction coefficient below kinetic: unusual, check the inputs.
    StaticBelowKinetic,
    /// A root search failed; the bracket is in the error.
    RootSearch(RootError),
    /// The jets give no torque at rest (all radial, or braking).
    NoDriveAtRest,
}

impl std::fmt::Display for Warning {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Warning::NozzleNotFlowing { arm } => write!(
                f,
                "nozzle on arm {} is not flowing: the pressure at it is zero or less",
                arm + 1
            ),
            Warning::HubBelowVapour { hub_pressure_pa } => write!(
                f,
                "hub pressure {:.0} kPa gauge is below vapour pressure: the arms would draw air",
                hub_pressure_pa / 1000.0
            ),
            Warning::KeepsTurningOnceSpun => {
                write!(f, "stalls at rest, but keeps turning once spun by hand")
            }
            Warning::NoEquilibriumBelow { cap_rad_s } => write!(
                f,
                "no equilibrium below {:.0} rpm (add drag or a brake)",
                rpm(*cap_rad_s)
            ),
            Warning::OtherEquilibria { count } => write!(
                f,
                "{count} other equilibri{} besides the operating point",
                if *count == 1 { "um" } else { "a" }
            ),
            Warning::NoFiniteRunaway => write!(
                f,
                "no finite runaway speed: the centrifugal pressure rise keeps the jets ahead of the arm"
            ),
            Warning::HighSupplyPressure { pressure_pa } => write!(
                f,
                "inlet pressure {:.0} kPa is above 552 kPa (80 psi): fit a pressure regulator",
                pressure_pa / 1000.0
            ),
            Warning::StaticBelowKinetic => write!(
                f,
                "static friction coefficient is below the kinetic one: check the bearing inputs"
            ),
            // Every root search here is over rotor speed ω in rad/s.
            Warning::RootSearch(e) => write!(
                f,
                "the speed search between {:.4} and {:.4} rpm ({:.6e} to {:.6e} rad/s) failed: {}; \
                 the results may miss an equilibrium there",
                rpm(e.lo),
                rpm(e.hi),
                e.lo,
                e.hi,
                e.reason
            ),
            Warning::NoDriveAtRest => write!(
                f,
                "the jets give no drive torque at rest (nozzles radial or facing forward)"
            ),
        }
    }
}

/// The operating point in full.
#[derive(Debug, Clone, PartialEq)]
pub struct OperatingPoint {
    /// Torques and water path at the operating speed.
    pub point: TorquePoint,
    /// The jet of every arm, in arm order (zero flow for an idle nozzle).
    pub jets: Vec<JetExit>,
    /// Stability (always true for an operating point found from rest).
    pub stable: bool,
}

impl OperatingPoint {
    /// Speed, rad/s.
    pub fn omega_rad_s(&self) -> f64 {
        self.point.omega_rad_s
    }
}

/// Everything the spin solver says about one design.
#[derive(Debug, Clone, PartialEq)]
pub struct SpinReport {
    /// Where it ends up.
    pub status: SpinStatus,
    /// The operating point when running (None when stalled or unbounded).
    pub operating: Option<OperatingPoint>,
    /// Every root of net torque on (0, ω_cap], lowest first.
    pub equilibria: Vec<Equilibrium>,
    /// Drive torque at rest, N·m.
    pub stall_torque_n_m: f64,
    /// Torque needed to start from rest, N·m.
    pub breakaway_torque_n_m: f64,
    /// Stall over breakaway torque (None when breakaway is zero).
    pub start_margin: Option<f64>,
    /// Frictionless runaway speed, rad/s (None when there is none).
    pub runaway_rad_s: Option<f64>,
    /// Upper end of the equilibrium search, rad/s.
    pub omega_cap_rad_s: f64,
    /// The water path at rest.
    pub at_rest: SupplyState,
    /// Spin-up times, when running.
    pub spin_up: Option<SpinUp>,
    /// Power balance at the operating point.
    pub power: Option<PowerBalance>,
    /// Rotor inertia used for spin-up, kg·m².
    pub inertia_kg_m2: f64,
    /// What the user should know.
    pub warnings: Vec<Warning>,
}

impl SpinReport {
    /// The water path a report describes: at the operating point when
    /// running, at rest otherwise (the water still flows through a stalled rotor).
    pub fn described_state(&self) -> &SupplyState {
        self.operating
            .as_ref()
            .map_or(&self.at_rest, |op| &op.point.state)
    }
}

fn root_tolerance(span: f64, scale: f64) -> Tolerance {
    Tolerance {
        x: 1e-14 * span,
        f: 1e-13 * scale,
        max_iter: 200,
    }
}

/// Scan speeds: a geometric grid of `points` from `floor·cap` to `cap`.
fn scan_grid(cap: f64, floor: f64, points: usize) -> impl Iterator<Item = f64> {
    let ratio = (1.0 / floor).powf(1.0 / (points as f64 - 1.0));
    (0..points).map(move |k| cap * floor * ratio.powi(k as i32))
}

/// Golden-section search for the point of `g` nearest zero on [a, c], where
/// g has the sign of `sign` at both ends and at b inside. Returns a point
/// where g changes sign, if the dip reaches through zero.
fn dip_through_zero(f: &mut impl FnMut(f64) -> f64, a: f64, c: f64, sign: f64) -> Option<f64> {
    let inv_phi = (5f64.sqrt() - 1.0) / 2.0;
    let (mut lo, mut hi) = (a, c);
    let mut x1 = hi - inv_phi * (hi - lo);
    let mut x2 = lo + inv_phi * (hi - lo);
    let (mut g1, mut g2) = (sign * f(x1), sign * f(x2));
    for _ in 0..40 {
        if g1 <= 0.0 {
            return Some(x1);
        }
        if g2 <= 0.0 {
            return Some(x2);
        }
        if g1 < g2 {
            hi = x2;
            (x2, g2) = (x1, g1);
            x1 = hi - inv_phi * (hi - lo);
            g1 = sign * f(x1);
        } else {
            lo = x1;
            (x1, g1) = (x2, g2);
            x2 = lo + inv_phi * (hi - lo);
            g2 = sign * f(x2);
        }
    }
    None
}

/// Every root of `f` on (0, cap], lowest first, each polished by Brent.
///
/// `at_zero` is f just above rest. Sign changes between grid points are
/// bracketed directly; where |f| dips toward zero between grid points without
/// changing sign, a golden-section search looks for a hidden pair of roots.
/// Returns the roots as (ω, stable) and any root-search failures.
fn scan_roots(
    mut f: impl FnMut(f64) -> f64,
    at_zero: f64,
    cap: f64,
    floor: f64,
    points: usize,
    scale: f64,
    first_only: bool,
) -> (Vec<Equilibrium>, Vec<RootError>) {
    let mut found = Vec::new();
    let mut errors = Vec::new();
    let mut polish =
        |f: &mut dyn FnMut(f64) -> f64, w0: f64, y0: f64, w1: f64, found: &mut Vec<Equilibrium>| {
            match brent(f, w0, w1, root_tolerance(w1 - w0, scale)) {
                Ok(root) => found.push(Equilibrium {
                    omega_rad_s: root,
                    stable: y0 > 0.0,
                }),
                Err(e) => errors.push(e),
            }
        };
    // The last sample and the one before it.
    let mut last: (f64, f64) = (0.0, at_zero);
    let mut before_last: Option<(f64, f64)> = None;
    for w in scan_grid(cap, floor, points) {
        let y = f(w);
        let (w1, y1) = last;
        if y1 == 0.0 && w1 > 0.0 {
            found.push(Equilibrium {
                omega_rad_s: w1,
                stable: y < 0.0,
            });
        } else if y1 != 0.0 && y != 0.0 && y1.signum() != y.signum() {
            polish(&mut f, w1, y1, w, &mut found);
        } else if let Some((w0, y0)) = before_last {
            // A dip toward zero at the middle of the last three samples.
            let same = y0.signum() == y1.signum() && y1.signum() == y.signum() && y1 != 0.0;
            if same && y1.abs() < y0.abs() && y1.abs() < y.abs() {
                let sign = y1.signum();
                if let Some(m) = dip_through_zero(&mut f, w0, w, sign) {
                    let ym = f(m);
                    polish(&mut f, w0, y0, m, &mut found);
                    polish(&mut f, m, ym, w, &mut found);
                }
            }
        }
        before_last = Some(last);
        last = (w, y);
        if first_only && !found.is_empty() {
            break;
        }
    }
    found.sort_by(|a, b| a.omega_rad_s.total_cmp(&b.omega_rad_s));
    found.dedup_by(|a, b| (a.omega_rad_s - b.omega_rad_s).abs() <= 1e-12 * b.omega_rad_s.abs());
    if first_only {
        found.truncate(1);
    }
    (found, errors)
}

/// What [`solve_with`] works out beyond the equilibria and the start check.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct SolveOptions {
    /// Integrate the spin-up from rest (about half the cost of a solve).
    pub spin_up: bool,
}

impl Default for SolveOptions {
    fn default() -> Self {
        SolveOptions { spin_up: true }
    }
}

/// Solve one design: start check, equilibria, operating point, spin-up, power.
pub fn solve(design: &Design) -> SpinReport {
    solve_with(design, &SolveOptions::default())
}

/// Solve one design for the speed alone: as [`solve`] without the spin-up
/// (`spin_up` is `None`). For sweeps, target searches and field checks, which
/// need the operating point but not how fast it is reached.
pub fn solve_speed(design: &Design) -> SpinReport {
    solve_with(design, &SolveOptions { spin_up: false })
}

/// [`solve`] with options.
pub fn solve_with(design: &Design, options: &SolveOptions) -> SpinReport {
    let model = SpinModel::new(design);
    let mut warnings = Vec::new();
    let r_max = design.rotor.tip_radius_m().max(1e-6);
    let tip_cap = CAP_TIP_SPEED_M_S / r_max;

    // At rest: stall torque and breakaway.
    let rest_state = model.state(0.0);
    let rest = model.point_from(rest_state.clone(), Motion::Breakaway);
    let stall = rest.drive_n_m;
    let breakaway = rest.resist.total_n_m();
    let torque_scale = stall.abs().max(breakaway).max(1e-12);
    let start_margin = (breakaway > 0.0).then(|| stall / breakaway);
    // Radial jets (δ = 90°) give a drive of cos 90° ≈ 6e-17 of the
    // tangential momentum flux, not exactly zero: compare with that flux.
    let rho = model.fluids.water.density_kg_m3;
    let tangential_flux_n_m: f64 = design
        .rotor
        .arms
        .iter()
        .zip(&rest_state.nozzles)
        .map(|(a, n)| rho * n.flow_m3_s * n.jet_speed_relative_m_s * a.radius_m)
        .sum();
    let no_drive_at_rest = stall <= 1e-9 * tangential_flux_n_m;
    if no_drive_at_rest {
        warnings.push(Warning::NoDriveAtRest);
    }
    if let super::design::Bearing::Washer(w) = design.friction.bearing {
        if w.mu_static < w.mu_kinetic {
            warnings.push(Warning::StaticBelowKinetic);
        }
    }

    // Frictionless runaway: first fall of drive torque through zero.
    let runaway = if !no_drive_at_rest {
        let (roots, errs) = scan_roots(
            |w| model.drive(w),
            stall,
            10.0 * tip_cap,
            RUNAWAY_FLOOR,
            RUNAWAY_POINTS,
            torque_scale,
            true,
        );
        warnings.extend(errs.into_iter().map(Warning::RootSearch));
        roots.first().map(|e| e.omega_rad_s)
    } else {
        None
    };
    if runaway.is_none() && !no_drive_at_rest {
        warnings.push(Warning::NoFiniteRunaway);
    }
    let cap = runaway.map_or(tip_cap, |r| (3.0 * r).max(tip_cap));

    let net_off_rest = model.point(0.0).net_n_m();
    let (equilibria, errs) = scan_roots(
        |w| model.net(w),
        net_off_rest,
        cap,
        SCAN_FLOOR,
        SCAN_POINTS,
        torque_scale,
        false,
    );
    warnings.extend(errs.into_iter().map(Warning::RootSearch));

    let starts = !no_drive_at_rest && start_margin.map_or(stall > 0.0, |m| m > 1.0);
    let inertia = model.inertia_kg_m2();
    // The first root reached from rest is the operating point, if net is
    // positive just off rest (kinetic friction) and that root is stable.
    let first_stable = equilibria.iter().find(|e| e.stable).copied();
    let spins_off_rest = net_off_rest > 0.0;
    let reached = match (equilibria.first(), first_stable) {
        (Some(first), Some(stable))
            if spins_off_rest && first.omega_rad_s == stable.omega_rad_s =>
        {
            Some(stable)
        }
        _ => None,
    };

    let status = if !starts || !spins_off_rest {
        if reached.is_some() || !equilibria.is_empty() || spins_off_rest {
            warnings.push(Warning::KeepsTurningOnceSpun);
        }
        SpinStatus::StallsAtRest
    } else if reached.is_some() {
        SpinStatus::Running
    } else {
        warnings.push(Warning::NoEquilibriumBelow { cap_rad_s: cap });
        SpinStatus::NoEquilibrium
    };

    let operating = match (status, reached) {
        (SpinStatus::Running, Some(eq)) => {
            let point = model.point(eq.omega_rad_s);
            let jets = jets(design, &point.state);
            Some(OperatingPoint {
                point,
                jets,
                stable: eq.stable,
            })
        }
        _ => None,
    };
    if let Some(op) = &operating {
        let others = equilibria.len() - 1;
        if others > 0 {
            warnings.push(Warning::OtherEquilibria { count: others });
        }
        note_state(&op.point.state, &model, &mut warnings);
    } else {
        note_state(&rest_state, &model, &mut warnings);
    }

    let spin_up = operating
        .as_ref()
        .filter(|_| options.spin_up)
        .and_then(|op| spin_up_times(&model, inertia, op.omega_rad_s(), net_off_rest));
    let power = operating.as_ref().map(|op| PowerBalance {
        shaft_w: op.point.drive_n_m * op.omega_rad_s(),
        hydraulic_w: op.point.state.inlet_pressure_pa * op.point.state.total_flow_m3_s,
        jet_kinetic_w: jet_kinetic_power_w(design, &op.point.state, model.rho()),
    });

    SpinReport {
        status,
        operating,
        equilibria,
        stall_torque_n_m: stall,
        breakaway_torque_n_m: breakaway,
        start_margin,
        runaway_rad_s: runaway,
        omega_cap_rad_s: cap,
        at_rest: rest_state,
        spin_up,
        power,
        inertia_kg_m2: inertia,
        warnings,
    }
}

fn note_state(state: &SupplyState, model: &SpinModel, warnings: &mut Vec<Warning>) {
    for (arm, n) in state.nozzles.iter().enumerate() {
        if !n.flowing {
            warnings.push(Warning::NozzleNotFlowing { arm });
        }
    }
    let absolute = state.hub_pressure_pa + model.fluids.air.pressure_pa;
    if absolute < model.fluids.water.vapour_pressure_pa {
        warnings.push(Warning::HubBelowVapour {
            hub_pressure_pa: state.hub_pressure_pa,
        });
    }
    if state.inlet_pressure_pa > REGULATOR_LIMIT_PA {
        warnings.push(Warning::HighSupplyPressure {
            pressure_pa: state.inlet_pressure_pa,
        });
    }
}

#[cfg(test)]
#[path = "balance_tests.rs"]
mod tests;
