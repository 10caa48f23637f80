//! The design as the physics core sees it: plain typed inputs, SI units.
//!
//! A [`Design`] is what a scenario file turns into after its unit tags have been
//! read and its values validated (see `crate::scenario`). Every field name
//! states its unit. Angles are radians here, whatever the file said.
//!
//! Sign conventions (model.md M1): the spin axis is +z through the hub, ground
//! is z = 0, and the rotor turns at ω ≥ 0 in its *drive sense*, which is
//! counter-clockwise seen from above (+ẑ). A nozzle's `deflection` δ is measured
//! in the horizontal plane from the arm's *backward* tangent: δ = 0 points the
//! jet straight back (most torque), δ = 90° radially outward (no torque),
//! δ < 0 inward, δ > 90° forward (brakes).

/// Standard gravity, m/s² (CGPM 1901).
pub const GRAVITY_M_S2: f64 = 9.806_65;

/// A complete sprinkler design, in SI units.
#[derive(Debug, Clone, PartialEq)]
pub struct Design {
    /// A name for reports.
    pub name: String,
    /// Water temperature, °C (0–50).
    pub water_temperature_c: f64,
    /// Where the sprinkler runs: air temperature and altitude.
    pub site: Site,
    /// How water reaches the sprinkler inlet.
    pub supply: Supply,
    /// Arms, nozzles, swivel and inertia.
    pub rotor: Rotor,
    /// Everything that resists rotation.
    pub friction: Friction,
    /// Drop-size spectrum overrides (model.md M8).
    pub spray: SpraySpec,
    /// Head layout for uniformity, if one is given.
    pub layout: Option<Layout>,
    /// Wind over the site.
    pub wind: Wind,
}

/// Air conditions at the site.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Site {
    /// Air temperature, °C.
    pub air_temperature_c: f64,
    /// Altitude above mean sea level, m (sets air pressure, ISA troposphere).
    pub altitude_m: f64,
    /// Height above ground of the lowest thing over the watered area (a wire,
    /// a branch, a roof), m, when stated: jets should stay below it.
    pub clearance_m: Option<f64>,
}

/// The water supply (model.md M4).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Supply {
    /// Gauge pressure held at the sprinkler inlet, Pa.
    Pressure {
        /// Inlet gauge pressure, Pa.
        inlet_pa: f64,
    },
    /// Total flow held fixed, m³/s (a positive-displacement feed).
    Flow {
        /// Total volumetric flow through the sprinkler, m³/s.
        total_m3_s: f64,
    },
    /// A source pressure fed through a hose or pipe.
    Line(Line),
}

/// A hose or pipe from a pressure source to the sprinkler inlet.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Line {
    /// Gauge pressure at the source (tap or pump), Pa.
    pub source_pa: f64,
    /// Hose length, m.
    pub length_m: f64,
    /// Hose bore (inside diameter), m.
    pub bore_m: f64,
    /// Absolute wall roughness, m.
    pub roughness_m: f64,
    /// Sum of minor-loss coefficients (fittings, couplings, entry), velocity heads.
    pub minor_k: f64,
    /// Rise from the source to the sprinkler inlet, m (negative: downhill).
    pub lift_m: f64,
}

/// The rotating part.
#[derive(Debug, Clone, PartialEq)]
pub struct Rotor {
    /// Radius at which the arms leave the hub, m (inner end of arm drag).
    pub hub_radius_m: f64,
    /// The swivel at the inlet.
    pub swivel: Swivel,
    /// The arms, each with one nozzle at its tip.
    pub arms: Vec<Arm>,
    /// Mass moment of inertia about the spin axis.
    pub inertia: Inertia,
}

impl Rotor {
    /// Radius of the farthest nozzle from the spin axis, m (0 with no arms):
    /// the radius that sets the tip speed.
    pub fn tip_radius_m(&self) -> f64 {
        self.arms.iter().map(|a| a.radius_m).fold(0.0, f64::max)
    }
}

/// The swivel: inlet bore and its loss coefficient.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Swivel {
    /// Inlet bore, m.
    pub inlet_bore_m: f64,
    /// Loss coefficient on the inlet velocity head, dimensionless.
    pub k: f64,
}

/// One arm and its tip nozzle.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Arm {
    /// Horizontal radius of the nozzle exit from the spin axis, m.
    pub radius_m: f64,
    /// Azimuth of the arm around the hub at t = 0, rad (for drawing and wind).
    pub azimuth_rad: f64,
    /// Height of the nozzle exit above ground, m (for the throw).
    pub height_m: f64,
    /// Rise of the arm from the swivel to the nozzle, m (hydrostatic loss).
    pub rise_m: f64,
    /// The arm tube.
    pub tube: Tube,
    /// The nozzle at the tip.
    pub nozzle: Nozzle,
}

/// The tube that carries water from the hub to the nozzle.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tube {
    /// Bore (inside diameter), m.
    pub bore_m: f64,
    /// Outside diameter, m (air drag, inertia estimate).
    pub outer_m: f64,
    /// Absolute wall roughness, m.
    pub roughness_m: f64,
    /// Minor-loss coefficients along the arm (elbow, entry), velocity heads.
    pub minor_k: f64,
    /// Developed tube length, m; `None` means the arm radius.
    pub length_m: Option<f64>,
}

/// A nozzle: size, direction and coefficients.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Nozzle {
    /// Exit diameter, m.
    pub diameter_m: f64,
    /// Jet angle above horizontal, rad (0..π/2).
    pub elevation_rad: f64,
    /// Jet angle from the backward tangent in the horizontal plane, rad.
    pub deflection_rad: f64,
    /// Discharge coefficient C_d (flow = C_d · area · ideal speed).
    pub cd: f64,
    /// Velocity coefficient C_v (jet speed = C_v · ideal speed).
    pub cv: f64,
}

/// How the rotor inertia is known.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Inertia {
    /// Measured or computed elsewhere, kg·m².
    Given {
        /// Mass moment of inertia about the spin axis, kg·m².
        kg_m2: f64,
    },
    /// Estimated from arm tubes, the water in them and tip masses.
    Estimate {
        /// Tube material density, kg/m³.
        tube_density_kg_m3: f64,
        /// Tube wall thickness, m (the outer diameter is the tube's).
        tube_wall_m: f64,
        /// Mass at each arm tip (nozzle body), kg.
        tip_mass_kg: f64,
    },
}

/// Resisting torque inputs (model.md M5).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Friction {
    /// The thrust bearing.
    pub bearing: Bearing,
    /// Seal drag.
    pub seal: Seal,
    /// Speed brake.
    pub brake: Brake,
    /// Drag coefficient of an arm tube in cross-flow.
    pub arm_drag_cd: f64,
}

/// The thrust bearing, from geometry or from a measurement.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Bearing {
    /// A flat thrust washer loaded by the axial force on the rotor.
    Washer(Washer),
    /// Running and breakaway torque measured at the unit, N·m.
    Measured {
        /// Torque to keep it turning slowly, N·m.
        running_n_m: f64,
        /// Torque to start it from rest, N·m.
        breakaway_n_m: f64,
    },
}

/// A flat thrust washer.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Washer {
    /// Kinetic friction coefficient.
    pub mu_kinetic: f64,
    /// Static (breakaway) friction coefficient.
    pub mu_static: f64,
    /// Inner radius, m.
    pub inner_m: f64,
    /// Outer radius, m.
    pub outer_m: f64,
    /// Area on which hub pressure lifts the rotor against the washer, m².
    pub thrust_area_m2: f64,
    /// Mass of the rotating part (it unloads the washer), kg.
    pub rotor_mass_kg: f64,
    /// Which contact-pressure assumption sets the effective radius.
    pub radius_rule: WasherRule,
}

/// How the friction radius of a flat washer is taken.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum WasherRule {
    /// A run-in washer: r_eff = (r_o + r_i)/2.
    #[default]
    UniformWear,
    /// A new washer: r_eff = ⅔(r_o³ − r_i³)/(r_o² − r_i²).
    UniformPressure,
}

/// Seal drag: a base torque plus a part that grows with hub pressure.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Seal {
    /// Torque at zero pressure, N·m.
    pub base_n_m: f64,
    /// Added torque per pascal of hub gauge pressure, N·m/Pa.
    pub per_pa_n_m: f64,
}

/// A speed brake: viscous and quadratic parts.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Brake {
    /// c₁, N·m·s/rad.
    pub viscous: f64,
    /// c₂, N·m·s²/rad².
    pub quadratic: f64,
}

/// Drop-size spectrum overrides; `None` means the documented default.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct SpraySpec {
    /// Volume median drop diameter d50, m.
    pub d50_m: Option<f64>,
    /// Rosin–Rammler spread exponent n.
    pub spread: Option<f64>,
    /// Largest drop diameter, m.
    pub largest_m: Option<f64>,
    /// Jet breakup coefficient C_b of the nozzles (intact length over
    /// d·√(ρ_w/ρ_air)); `None`: the published default 11 (model.md M7).
    pub breakup: Option<f64>,
}

/// A head layout for overlap and uniformity (model.md M9).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Layout {
    /// Heads on a square grid S × S.
    Square {
        /// Head spacing along a row, m.
        spacing_m: f64,
    },
    /// Heads S apart along rows, rows L apart.
    Rectangle {
        /// Head spacing along a row, m.
        spacing_m: f64,
        /// Row spacing, m.
        rows_m: f64,
    },
    /// Equilateral triangles: S along a row, rows S·√3/2 apart, alternate rows offset S/2.
    Triangle {
        /// Head spacing along a row, m.
        spacing_m: f64,
    },
}

impl Layout {
    /// Head spacing along a row, m.
    pub fn spacing_m(&self) -> f64 {
        match *self {
            Layout::Square { spacing_m }
            | Layout::Rectangle { spacing_m, .. }
            | Layout::Triangle { spacing_m } => spacing_m,
        }
    }

    /// Row spacing, m.
    pub fn rows_m(&self) -> f64 {
        match *self {
            Layout::Square { spacing_m } => spacing_m,
            Layout::Rectangle { rows_m, .. } => rows_m,
            Layout::Triangle { spacing_m } => spacing_m * 3f64.sqrt() / 2.0,
        }
    }

    /// Ground area served by one head, m².
    pub fn area_per_head_m2(&self) -> f64 {
        self.spacing_m() * self.rows_m()
    }
}

/// Wind over the site.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Wind {
    /// Wind speed at nozzle height, m/s.
    pub speed_m_s: f64,
    /// Direction the wind blows *from*, rad, measured counter-clockwise from +x.
    pub from_rad: f64,
}

impl Wind {
    /// Wind velocity vector in the ground frame, m/s (it blows toward `from + π`).
    pub fn velocity(&self) -> nalgebra::Vector3<f64> {
        nalgebra::Vector3::new(
            -self.speed_m_s * self.from_rad.cos(),
            -self.speed_m_s * self.from_rad.sin(),
            0.0,
        )
    }
}

impl Arm {
    /// Developed tube length from hub to nozzle, m.
    pub fn tube_length_m(&self) -> f64 {
        self.tube.length_m.unwrap_or(self.radius_m)
    }
}
