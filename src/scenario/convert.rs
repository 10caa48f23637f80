//! File values to the SI design and back, with validation.
//!
//! [`Scenario::to_design`] reads every value once, checks it against the
//! range the model can use, and collects *every* problem with its field path
//! (`rotor.arms[1].nozzle.diameter`) and the allowed range, so a technician
//! can fix a file in one pass. Nothing is clamped: a value out of range is an
//! error, never silently moved.
//!
//! [`Scenario::from_design`] goes the other way, writing each SI value with the
//! tag a practitioner in the chosen unit system would use.

use std::fmt;

use super::schema::{self, DropSize, Scenario, Spread, FORMAT_VERSION};
use super::tags::{
    Angle, Area, Density, FlowRate, Length, Mass, MomentOfInertia, Pressure, Speed, Temperature,
    Torque,
};
use super::ScenarioError;
use crate::physics::design::{self as d, Design};
use crate::units::UnitSystem;

/// One thing wrong with a scenario's values.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Problem {
    /// Where: the field path, e.g. `rotor.arms[1].nozzle.diameter`.
    pub path: String,
    /// The value as written, e.g. `mm(7)`.
    pub value: String,
    /// What is wrong and what is allowed.
    pub rule: String,
}

impl fmt::Display for Problem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{} = {}: {}", self.path, self.value, self.rule)
    }
}

/// Every problem found in one scenario (never empty when returned as an error).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Problems(pub Vec<Problem>);

impl fmt::Display for Problems {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.0.as_slice() {
            [one] => write!(f, "{one}"),
            many => {
                write!(f, "{} problems:", many.len())?;
                for p in many {
                    write!(f, "\n  - {p}")?;
                }
                Ok(())
            }
        }
    }
}

/// A value as written in the file and its SI value.
trait Written: fmt::Display + Copy {
    fn si(self) -> f64;
}

macro_rules! written {
    ($($t:ty),*) => {
        $(impl Written for $t {
            fn si(self) -> f64 {
                <$t>::si(self)
            }
        })*
    };
}
written!(
    Length,
    Pressure,
    FlowRate,
    Angle,
    Temperature,
    Torque,
    Mass,
    Area,
    Speed,
    MomentOfInertia,
    Density
);

impl Written for f64 {
    fn si(self) -> f64 {
        self
    }
}

/// Collects problems while values are read.
#[derive(Default)]
struct Checker {
    problems: Vec<Problem>,
}

impl Checker {
    fn push(&mut self, path: &str, value: impl fmt::Display, rule: impl Into<String>) {
        self.problems.push(Problem {
            path: path.to_string(),
            value: value.to_string(),
            rule: rule.into(),
        });
    }

    /// The SI value if it is a finite number; records a problem otherwise.
    fn finite<T: Written>(&mut self, path: &str, v: T) -> Option<f64> {
        let si = v.si();
        if si.is_finite() {
            Some(si)
        } else {
            self.push(path, v, "must be a finite number (not inf or NaN)");
            None
        }
    }

    /// The SI value if it is finite and of a size the model computes with:
    /// at most [`MAX_MAGNITUDE_SI`], and, unless zero, at least
    /// [`MIN_MAGNITUDE_SI`] (a bore of 10⁻²⁰⁴ m has an area of zero in
    /// floating point, a pressure of 10³⁰⁰ Pa overflows the flow equations).
    fn sized<T: Written>(&mut self, path: &str, v: T) -> Option<f64> {
        let si = self.finite(path, v)?;
        // 10⁻⁹ slack at both limits, as in `between`, for values saved in other units.
        if si.abs() > MAX_MAGNITUDE_SI * (1.0 + 1e-9) {
            self.push(
                path,
                v,
                "is too large for the model (more than 1e9 in SI units: m, Pa, m³/s, N·m, kg)",
            );
            None
        } else if si != 0.0 && si.abs() < MIN_MAGNITUDE_SI * (1.0 - 1e-9) {
            self.push(
                path,
                v,
                "is too small for the model (less than 1e-9 in SI units: m, Pa, m³/s, N·m, kg); write 0 where zero is allowed",
            );
            None
        } else {
            Some(si)
        }
    }

    fn any<T: Written>(&mut self, path: &str, v: T) -> f64 {
        match self.finite(path, v) {
            Some(si) if si.abs() > MAX_MAGNITUDE_SI * (1.0 + 1e-9) => {
                self.push(
                    path,
                    v,
                    "is too large for the model (more than 1e9 in SI units)",
                );
                0.0
            }
            Some(si) => si,
            None => 0.0,
        }
    }

    fn positive<T: Written>(&mut self, path: &str, v: T) -> f64 {
        match self.sized(path, v) {
            Some(si) if si > 0.0 => si,
            Some(_) => {
                self.push(path, v, "must be greater than zero");
                0.0
            }
            None => 0.0,
        }
    }

    fn non_negative<T: Written>(&mut self, path: &str, v: T) -> f64 {
        match self.sized(path, v) {
            Some(si) if si >= 0.0 => si,
            Some(_) => {
                self.push(path, v, "must not be negative");
                0.0
            }
            None => 0.0,
        }
    }

    /// A value in [lo, hi]. The ends are widened by 10⁻⁹ of the range's size so
    /// that a value written at an end in other units (−500 m saved as
    /// `ft(-1640.41994751)`, 12 significant figures) reads back as valid;
    /// the value itself is kept as written.
    fn between<T: Written>(&mut self, path: &str, v: T, lo: f64, hi: f64, rule: &str) -> f64 {
        let slack = 1e-9 * lo.abs().max(hi.abs());
        match self.finite(path, v) {
            Some(si) if (lo - slack..=hi + slack).contains(&si) => si,
            Some(si) => {
                self.push(path, v, rule);
                si
            }
            None => 0.0,
        }
    }

    /// A coefficient in (0, 1].
    fn coefficient(&mut self, path: &str, v: f64) -> f64 {
        match self.finite(path, v) {
            Some(si) if si > 0.0 && si <= 1.0 => si,
            Some(si) => {
                self.push(path, v, "must be above 0 and at most 1");
                si
            }
            None => 0.0,
        }
    }
}

const DEG: f64 = std::f64::consts::PI / 180.0;

/// Largest size of a value the model computes with, in SI units. Far above
/// any sprinkler (1 GPa, 1e9 m³/s), far below floating-point overflow.
const MAX_MAGNITUDE_SI: f64 = 1e9;
/// Smallest non-zero size of a value the model computes with, in SI units
/// (1 nm, 1 nPa, 1 nN·m): far below any sprinkler part, far above underflow.
const MIN_MAGNITUDE_SI: f64 = 1e-9;

impl Scenario {
    /// Checks every value and builds the SI design the physics core takes.
    ///
    /// On failure the error lists every problem with its field path and the
    /// allowed range. Loading a file ([`super::load_str`], [`super::load_file`])
    /// runs this too, so a loaded scenario always converts.
    pub fn to_design(&self) -> Result<Design, ScenarioError> {
        let mut c = Checker::default();
        if self.version != FORMAT_VERSION {
            c.push(
                "version",
                self.version,
                format!("this build reads scenario format version {FORMAT_VERSION}"),
            );
        }

        let water_temperature_c = c.between(
            "water.temperature",
            self.water.temperature,
            0.0,
            50.0,
            "must be between 0 and 50 °C (32–122 °F), the range of the water property correlations",
        );
        let site = d::Site {
            air_temperature_c: c.between(
                "air.temperature",
                self.air.temperature,
                -40.0,
                60.0,
                "must be between -40 and 60 °C (-40–140 °F)",
            ),
            altitude_m: c.between(
                "air.altitude",
                self.air.altitude,
                -500.0,
                11_000.0,
                "must be between -500 m and 11000 m (the standard atmosphere's troposphere)",
            ),
            clearance_m: self.clearance.map(|h| {
                c.between(
                    "clearance",
                    h,
                    0.0,
                    1000.0,
                    "must be between 0 and 1000 m (the height of the lowest thing overhead)",
                )
            }),
        };

        let supply = match self.supply {
            schema::Supply::Pressure(p) => d::Supply::Pressure {
                inlet_pa: c.positive("supply.Pressure", p),
            },
            schema::Supply::Flow(q) => d::Supply::Flow {
                total_m3_s: c.positive("supply.Flow", q),
            },
            schema::Supply::Line {
                source,
                length,
                bore,
                roughness,
                minor_k,
                lift,
            } => {
                let bore_m = c.positive("supply.Line.bore", bore);
                let roughness_m = c.non_negative("supply.Line.roughness", roughness);
                if bore_m > 0.0 && roughness_m >= bore_m / 2.0 {
                    c.push(
                        "supply.Line.roughness",
                        roughness,
                        format!("must be smaller than half the bore {bore}"),
                    );
                }
                d::Supply::Line(d::Line {
                    source_pa: c.positive("supply.Line.source", source),
                    length_m: c.positive("supply.Line.length", length),
                    bore_m,
                    roughness_m,
                    minor_k: c.non_negative("supply.Line.minor_k", minor_k),
                    lift_m: c.any("supply.Line.lift", lift),
                })
            }
        };

        let rotor = self.rotor_design(&mut c);
        let friction = self.friction_design(&mut c);
        let spray = self.spray_design(&mut c);
        let layout = self.layout.map(|l| match l {
            schema::Layout::Square { spacing } => d::Layout::Square {
                spacing_m: c.positive("layout.Square.spacing", spacing),
            },
            schema::Layout::Rectangle { spacing, rows } => d::Layout::Rectangle {
                spacing_m: c.positive("layout.Rectangle.spacing", spacing),
                rows_m: c.positive("layout.Rectangle.rows", rows),
            },
            schema::Layout::Triangle { spacing } => d::Layout::Triangle {
                spacing_m: c.positive("layout.Triangle.spacing", spacing),
            },
        });
        let wind = d::Wind {
            speed_m_s: c.non_negative("wind.speed", self.wind.speed),
            from_rad: c.any("wind.from", self.wind.from),
        };

        if !c.problems.is_empty() {
            return Err(ScenarioError::Invalid {
                origin: format!("scenario \"{}\"", self.name),
                problems: Problems(c.problems),
            });
        }
        Ok(Design {
            name: self.name.clone(),
            water_temperature_c,
            site,
            supply,
            rotor,
            friction,
            spray,
            layout,
            wind,
        })
    }

    fn rotor_design(&self, c: &mut Checker) -> d::Rotor {
        let r = &self.rotor;
        let hub_radius_m = c.non_negative("rotor.hub_radius", r.hub_radius);
        let swivel = d::Swivel {
            inlet_bore_m: c.positive("rotor.swivel.inlet_bore", r.swivel.inlet_bore),
            k: c.non_negative("rotor.swivel.k", r.swivel.k),
        };
        if r.arms.is_empty() {
            c.push(
                "rotor.arms",
                "[]",
                "a rotor needs at least one arm with a nozzle",
            );
        }
        let mut arms = Vec::with_capacity(r.arms.len());
        for (i, arm) in r.arms.iter().enumerate() {
            let p = |field: &str| format!("rotor.arms[{i}].{field}");
            let radius_m = c.positive(&p("radius"), arm.radius);
            if radius_m > 0.0 && hub_radius_m >= radius_m {
                c.push(
                    &p("radius"),
                    arm.radius,
                    format!(
                        "must be larger than rotor.hub_radius = {}: the arm must reach past the hub",
                        r.hub_radius
                    ),
                );
            }
            let bore_m = c.positive(&p("tube.bore"), arm.tube.bore);
            let outer_m = c.positive(&p("tube.outer"), arm.tube.outer);
            if bore_m > 0.0 && outer_m > 0.0 && outer_m <= bore_m {
                c.push(
                    &p("tube.outer"),
                    arm.tube.outer,
                    format!(
                        "must be larger than the bore {}: a tube's outside is wider than its inside",
                        arm.tube.bore
                    ),
                );
            }
            let roughness_m = c.non_negative(&p("tube.roughness"), arm.tube.roughness);
            if bore_m > 0.0 && roughness_m >= bore_m / 2.0 {
                c.push(
                    &p("tube.roughness"),
                    arm.tube.roughness,
                    format!("must be smaller than half the bore {}", arm.tube.bore),
                );
            }
            let length_m = arm.tube.length.map(|l| {
                let len = c.positive(&p("tube.length"), l);
                let span = radius_m - hub_radius_m;
                if len > 0.0 && span > 0.0 && len < span * (1.0 - 1e-9) {
                    c.push(
                        &p("tube.length"),
                        l,
                        format!(
                            "must be at least the radius minus the hub radius ({} − {}): the tube reaches from the hub to the nozzle",
                            arm.radius, r.hub_radius
                        ),
                    );
                }
                len
            });
            let diameter_m = c.positive(&p("nozzle.diameter"), arm.nozzle.diameter);
            // (10⁻⁹ slack: a nozzle as wide as its tube, saved in other units, reads back)
            if diameter_m > 0.0 && bore_m > 0.0 && diameter_m > bore_m * (1.0 + 1e-9) {
                c.push(
                    &p("nozzle.diameter"),
                    arm.nozzle.diameter,
                    format!(
                        "is wider than the tube bore {}: a nozzle can be at most as wide as its tube",
                        arm.tube.bore
                    ),
                );
            }
            arms.push(d::Arm {
                radius_m,
                azimuth_rad: c.any(&p("azimuth"), arm.azimuth),
                height_m: c.non_negative(&p("height"), arm.height),
                rise_m: arm.rise.map_or(0.0, |rise| c.any(&p("rise"), rise)),
                tube: d::Tube {
                    bore_m,
                    outer_m,
                    roughness_m,
                    minor_k: c.non_negative(&p("tube.minor_k"), arm.tube.minor_k),
                    length_m,
                },
                nozzle: d::Nozzle {
                    diameter_m,
                    elevation_rad: c.between(
                        &p("nozzle.elevation"),
                        arm.nozzle.elevation,
                        0.0,
                        90.0 * DEG * (1.0 + 1e-12),
                        "must be between 0° (level) and 90° (straight up)",
                    ),
                    deflection_rad: c.between(
                        &p("nozzle.deflection"),
                        arm.nozzle.deflection,
                        -180.0 * DEG * (1.0 + 1e-12),
                        180.0 * DEG * (1.0 + 1e-12),
                        "must be between -180° and 180° (0 = straight back along the arm's tangent, 90 = outward)",
                    ),
                    cd: c.coefficient(&p("nozzle.cd"), arm.nozzle.cd),
                    cv: c.coefficient(&p("nozzle.cv"), arm.nozzle.cv),
                },
            });
        }

        let inertia = match r.inertia {
            schema::Inertia::Given(i) => d::Inertia::Given {
                kg_m2: c.positive("rotor.inertia.Given", i),
            },
            schema::Inertia::Estimate {
                tube_density,
                tube_wall,
                tip_mass,
            } => {
                let wall_path = "rotor.inertia.Estimate.tube_wall";
                let tube_wall_m = c.positive(wall_path, tube_wall);
                if let Some((i, arm)) = arms.iter().enumerate().find(|(_, a)| {
                    // 10⁻⁹ slack for a value saved at the limit in other units.
                    a.tube.outer_m > 0.0 && tube_wall_m > a.tube.outer_m / 2.0 * (1.0 + 1e-9)
                }) {
                    c.push(
                        wall_path,
                        tube_wall,
                        format!(
                            "is thicker than half the outer diameter of rotor.arms[{i}].tube.outer = {}",
                            r.arms.get(i).map_or_else(
                                || Length::m(arm.tube.outer_m).to_string(),
                                |a| a.tube.outer.to_string()
                            )
                        ),
                    );
                }
                d::Inertia::Estimate {
                    tube_density_kg_m3: c
                        .positive("rotor.inertia.Estimate.tube_density", tube_density),
                    tube_wall_m,
                    tip_mass_kg: c.non_negative("rotor.inertia.Estimate.tip_mass", tip_mass),
                }
            }
        };

        d::Rotor {
            hub_radius_m,
            swivel,
            arms,
            inertia,
        }
    }

    fn friction_design(&self, c: &mut Checker) -> d::Friction {
        let f = &self.friction;
        let bearing = match f.bearing {
            schema::Bearing::Washer {
                mu_kinetic,
                mu_static,
                inner,
                outer,
                thrust_area,
                rotor_mass,
                radius_rule,
            } => {
                let p = |field: &str| format!("friction.bearing.Washer.{field}");
                let inner_m = c.non_negative(&p("inner"), inner);
                let outer_m = c.positive(&p("outer"), outer);
                if outer_m > 0.0 && inner_m >= outer_m {
                    c.push(
                        &p("inner"),
                        inner,
                        format!("must be smaller than the outer radius {outer}"),
                    );
                }
                d::Bearing::Washer(d::Washer {
                    mu_kinetic: c.non_negative(&p("mu_kinetic"), mu_kinetic),
                    mu_static: c.non_negative(&p("mu_static"), mu_static),
                    inner_m,
                    outer_m,
                    thrust_area_m2: c.non_negative(&p("thrust_area"), thrust_area),
                    rotor_mass_kg: c.positive(&p("rotor_mass"), rotor_mass),
                    radius_rule: match radius_rule {
                        schema::WasherRule::UniformWear => d::WasherRule::UniformWear,
                        schema::WasherRule::UniformPressure => d::WasherRule::UniformPressure,
                    },
                })
            }
            schema::Bearing::Measured { running, breakaway } => d::Bearing::Measured {
                running_n_m: c.non_negative("friction.bearing.Measured.running", running),
                breakaway_n_m: c.non_negative("friction.bearing.Measured.breakaway", breakaway),
            },
        };
        d::Friction {
            bearing,
            seal: d::Seal {
                base_n_m: c.non_negative("friction.seal.base", f.seal.base),
                // The file gives torque per kPa; the design per Pa.
                per_pa_n_m: c.non_negative("friction.seal.per_kpa", f.seal.per_kpa) / 1.0e3,
            },
            brake: d::Brake {
                viscous: c.non_negative("friction.brake.viscous", f.brake.viscous),
                quadratic: c.non_negative("friction.brake.quadratic", f.brake.quadratic),
            },
            arm_drag_cd: c.non_negative("friction.arm_drag_cd", f.arm_drag_cd),
        }
    }

    fn spray_design(&self, c: &mut Checker) -> d::SpraySpec {
        let s = &self.spray;
        let mut size = |path: &str, v: DropSize| {
            v.si().map(|si| {
                if !si.is_finite() {
                    c.push(path, v, "must be a finite number (not inf or NaN)");
                    0.0
                } else if si <= 0.0 {
                    c.push(path, v, "must be greater than zero (or Auto)");
                    0.0
                } else {
                    si
                }
            })
        };
        let d50_m = size("spray.d50", s.d50);
        let largest_m = size("spray.largest", s.largest);
        if let (Some(d50), Some(largest)) = (d50_m, largest_m) {
            if d50 > 0.0 && largest > 0.0 && largest <= d50 {
                c.push(
                    "spray.largest",
                    s.largest,
                    format!(
                        "must be larger than spray.d50 = {}: the median drop cannot be the largest",
                        s.d50
                    ),
                );
            }
        }
        let spread = match s.spread {
            Spread::Auto => None,
            Spread::Value(n) => Some(c.positive("spray.spread", n)),
        };
        d::SpraySpec {
            d50_m,
            spread,
            largest_m,
        }
    }

    /// Writes a design as a scenario in `units`: lengths of parts in mm or in,
    /// hoses and spacing in m or ft, kPa or psi, L/min or gpm, °C or °F, N·m
    /// or lbf·in, g or oz (rotor mass g or lb). `notes` goes into the file.
    ///
    /// Values are written to 12 significant figures, so the file reads back
    /// to the same design within 10⁻¹¹ relative.
    pub fn from_design(design: &Design, units: UnitSystem, notes: &str) -> Scenario {
        let u = units;
        let supply = match design.supply {
            d::Supply::Pressure { inlet_pa } => {
                schema::Supply::Pressure(Pressure::in_system(inlet_pa, u))
            }
            d::Supply::Flow { total_m3_s } => {
                schema::Supply::Flow(FlowRate::in_system(total_m3_s, u))
            }
            d::Supply::Line(l) => schema::Supply::Line {
                source: Pressure::in_system(l.source_pa, u),
                length: Length::large(l.length_m, u),
                bore: Length::small(l.bore_m, u),
                roughness: Length::small(l.roughness_m, u),
                minor_k: l.minor_k,
                lift: Length::large(l.lift_m, u),
            },
        };
        let arms = design
            .rotor
            .arms
            .iter()
            .map(|a| schema::Arm {
                radius: Length::small(a.radius_m, u),
                azimuth: Angle::in_system(a.azimuth_rad, u),
                height: Length::small(a.height_m, u),
                rise: (a.rise_m != 0.0).then(|| Length::small(a.rise_m, u)),
                tube: schema::Tube {
                    bore: Length::small(a.tube.bore_m, u),
                    outer: Length::small(a.tube.outer_m, u),
                    roughness: Length::small(a.tube.roughness_m, u),
                    minor_k: a.tube.minor_k,
                    length: a.tube.length_m.map(|l| Length::small(l, u)),
                },
                nozzle: schema::Nozzle {
                    diameter: Length::small(a.nozzle.diameter_m, u),
                    elevation: Angle::in_system(a.nozzle.elevation_rad, u),
                    deflection: Angle::in_system(a.nozzle.deflection_rad, u),
                    cd: a.nozzle.cd,
                    cv: a.nozzle.cv,
                },
            })
            .collect();
        let inertia = match design.rotor.inertia {
            d::Inertia::Given { kg_m2 } => {
                schema::Inertia::Given(MomentOfInertia::in_system(kg_m2, u))
            }
            d::Inertia::Estimate {
                tube_density_kg_m3,
                tube_wall_m,
                tip_mass_kg,
            } => schema::Inertia::Estimate {
                tube_density: Density::in_system(tube_density_kg_m3, u),
                tube_wall: Length::small(tube_wall_m, u),
                tip_mass: Mass::small(tip_mass_kg, u),
            },
        };
        let f = &design.friction;
        let bearing = match f.bearing {
            d::Bearing::Washer(w) => schema::Bearing::Washer {
                mu_kinetic: w.mu_kinetic,
                mu_static: w.mu_static,
                inner: Length::small(w.inner_m, u),
                outer: Length::small(w.outer_m, u),
                thrust_area: Area::in_system(w.thrust_area_m2, u),
                rotor_mass: Mass::rotor(w.rotor_mass_kg, u),
                radius_rule: match w.radius_rule {
                    d::WasherRule::UniformWear => schema::WasherRule::UniformWear,
                    d::WasherRule::UniformPressure => schema::WasherRule::UniformPressure,
                },
            },
            d::Bearing::Measured {
                running_n_m,
                breakaway_n_m,
            } => schema::Bearing::Measured {
                running: Torque::in_system(running_n_m, u),
                breakaway: Torque::in_system(breakaway_n_m, u),
            },
        };
        let drop = |m: Option<f64>| match (m, u) {
            (None, _) => DropSize::Auto,
            (Some(v), UnitSystem::Metric) => DropSize::mm(Length::mm(0.0).with_si(v).number()),
            (Some(v), UnitSystem::Us) => DropSize::r#in(Length::r#in(0.0).with_si(v).number()),
        };
        Scenario {
            version: FORMAT_VERSION,
            name: design.name.clone(),
            notes: notes.to_string(),
            water: schema::Water {
                temperature: Temperature::in_system(design.water_temperature_c, u),
            },
            air: schema::Air {
                temperature: Temperature::in_system(design.site.air_temperature_c, u),
                altitude: Length::large(design.site.altitude_m, u),
            },
            clearance: design.site.clearance_m.map(|h| Length::large(h, u)),
            supply,
            rotor: schema::Rotor {
                hub_radius: Length::small(design.rotor.hub_radius_m, u),
                swivel: schema::Swivel {
                    inlet_bore: Length::small(design.rotor.swivel.inlet_bore_m, u),
                    k: design.rotor.swivel.k,
                },
                arms,
                inertia,
            },
            friction: schema::Friction {
                bearing,
                seal: schema::Seal {
                    base: Torque::in_system(f.seal.base_n_m, u),
                    per_kpa: Torque::in_system(f.seal.per_pa_n_m * 1.0e3, u),
                },
                brake: schema::Brake {
                    viscous: f.brake.viscous,
                    quadratic: f.brake.quadratic,
                },
                arm_drag_cd: f.arm_drag_cd,
            },
            spray: schema::Spray {
                d50: drop(design.spray.d50_m),
                spread: design.spray.spread.map_or(Spread::Auto, Spread::Value),
                largest: drop(design.spray.largest_m),
            },
            layout: design.layout.map(|l| match l {
                d::Layout::Square { spacing_m } => schema::Layout::Square {
                    spacing: Length::large(spacing_m, u),
                },
                d::Layout::Rectangle { spacing_m, rows_m } => schema::Layout::Rectangle {
                    spacing: Length::large(spacing_m, u),
                    rows: Length::large(rows_m, u),
                },
                d::Layout::Triangle { spacing_m } => schema::Layout::Triangle {
                    spacing: Length::large(spacing_m, u),
                },
            }),
            wind: schema::Wind {
                speed: Speed::wind(design.wind.speed_m_s, u),
                from: Angle::in_system(design.wind.from_rad, u),
            },
        }
    }
}
