//! File values to the SI design and back, with validation.
//!
//! [`Scenario::to_design`] reads every value once, checks it against the
//! range the model can use, and collects *every* problem with its field path
//! (`rotor.arms[1].nozzle.diameter`) and the allowed range, so a technician
//! can fix a file in one pass. Nothing is clamped: a value out of range is an
//! error, never silently moved.
//!
//! [`Scenario::from_design`] goes the other way (in `write`), writing each SI
//! value with the tag a practitioner in the chosen unit system would use.

use std::fmt;

use super::schema::{self, Breakup, DropSize, Scenario, Spread, FORMAT_VERSION};
use super::tags::{
    Angle, Area, Density, FlowRate, Length, Mass, MomentOfInertia, Pressure, Speed, Temperature,
    Torque,
};
use super::ScenarioError;
use crate::catalogue::{self as cat, Input, Range};
use crate::physics::design::{self as d, Design};

mod write;

/// One thing wrong with a scenario's values.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Problem {
    /// Where: the field path, e.g. `rotor.arms[1].nozzle.diameter`.
    pub path: String,
    /// The value as written, e.g. `mm(7)`.
    pub value: String,
    /// What is wrong and what is allowed.
    pub rule: String,
    /// The line of the field in the file (1-based), when the scenario was
    /// read from text; `None` for a scenario built in memory.
    pub line: Option<usize>,
}

impl fmt::Display for Problem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if let Some(line) = self.line {
            write!(f, "line {line}: ")?;
        }
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
            line: None,
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

    /// A value of catalogue input `input` (of arm `arm`), checked against
    /// the catalogue's range and recorded under the catalogue's path.
    fn input<T: Written>(&mut self, input: &Input, arm: Option<usize>, v: T) -> f64 {
        let path = input.path_at(arm);
        match input.range {
            Range::Any | Range::Unchecked => self.any(&path, v),
            Range::Positive => self.positive(&path, v),
            Range::NonNegative => self.non_negative(&path, v),
            Range::Between { lo, hi, rule } => self.between(&path, v, lo, hi, rule),
            Range::Fraction => self.coefficient(&path, v),
        }
    }

    /// A coefficient in (0, 1].
    fn coefficient<T: Written>(&mut self, path: &str, v: T) -> f64 {
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

use crate::physics::hydraulics;

/// Pascals in one pound-force per square inch.
const PA_PER_PSI: f64 = 6_894.757_293_168;

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

        let water_temperature_c = c.input(&cat::WATER_TEMPERATURE, None, self.water.temperature);
        let site = d::Site {
            air_temperature_c: c.input(&cat::AIR_TEMPERATURE, None, self.air.temperature),
            altitude_m: c.input(&cat::ALTITUDE, None, self.air.altitude),
            clearance_m: self.clearance.map(|h| c.input(&cat::CLEARANCE, None, h)),
        };

        let supply = match self.supply {
            schema::Supply::Pressure(p) => d::Supply::Pressure {
                inlet_pa: c.input(&cat::INLET_PRESSURE, None, p),
            },
            schema::Supply::Flow(q) => d::Supply::Flow {
                total_m3_s: c.input(&cat::TOTAL_FLOW, None, q),
            },
            schema::Supply::Line {
                source,
                length,
                bore,
                roughness,
                minor_k,
                lift,
            } => {
                let bore_m = c.input(&cat::LINE_BORE, None, bore);
                let roughness_m = c.input(&cat::LINE_ROUGHNESS, None, roughness);
                if bore_m > 0.0 && roughness_m >= bore_m / 2.0 {
                    c.push(
                        cat::LINE_ROUGHNESS.path,
                        roughness,
                        format!("must be smaller than half the bore {bore}"),
                    );
                }
                d::Supply::Line(d::Line {
                    source_pa: c.input(&cat::LINE_SOURCE, None, source),
                    length_m: c.input(&cat::LINE_LENGTH, None, length),
                    bore_m,
                    roughness_m,
                    minor_k: c.input(&cat::LINE_MINOR_K, None, minor_k),
                    lift_m: c.input(&cat::LINE_LIFT, None, lift),
                })
            }
        };

        let rotor = self.rotor_design(&mut c);
        if let (d::Supply::Flow { total_m3_s }, schema::Supply::Flow(q)) = (supply, self.supply) {
            let rho = crate::physics::fluid::WaterProps::at(water_temperature_c).density_kg_m3;
            let need = hydraulics::least_nozzle_pressure_for_flow_pa(&rotor.arms, total_m3_s, rho);
            if let Some(need) = need.filter(|p| *p > hydraulics::MAX_NOZZLE_PRESSURE_PA) {
                c.push(
                    "supply.Flow",
                    q,
                    format!(
                        "cannot pass through these nozzles: it would need at least {:.0} kPa \
                         ({:.0} psi) across them, and the model covers up to {:.0} kPa \
                         ({:.0} psi); give larger nozzles or less flow",
                        need / 1e3,
                        need / PA_PER_PSI,
                        hydraulics::MAX_NOZZLE_PRESSURE_PA / 1e3,
                        hydraulics::MAX_NOZZLE_PRESSURE_PA / PA_PER_PSI
                    ),
                );
            }
        }
        let friction = self.friction_design(&mut c);
        let spray = self.spray_design(&mut c);
        let layout = self.layout.map(|l| match l {
            schema::Layout::Square { spacing } => d::Layout::Square {
                spacing_m: c.input(&cat::SQUARE_SPACING, None, spacing),
            },
            schema::Layout::Rectangle { spacing, rows } => d::Layout::Rectangle {
                spacing_m: c.input(&cat::RECTANGLE_SPACING, None, spacing),
                rows_m: c.input(&cat::RECTANGLE_ROWS, None, rows),
            },
            schema::Layout::Triangle { spacing } => d::Layout::Triangle {
                spacing_m: c.input(&cat::TRIANGLE_SPACING, None, spacing),
            },
        });
        let wind = d::Wind {
            speed_m_s: c.input(&cat::WIND_SPEED, None, self.wind.speed),
            from_rad: c.input(&cat::WIND_FROM, None, self.wind.from),
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
        let hub_radius_m = c.input(&cat::HUB_RADIUS, None, r.hub_radius);
        let swivel = d::Swivel {
            inlet_bore_m: c.input(&cat::SWIVEL_BORE, None, r.swivel.inlet_bore),
            k: c.input(&cat::SWIVEL_K, None, r.swivel.k),
        };
        if r.arms.is_empty() {
            c.push(
                cat::ARM_COUNT.path,
                "[]",
                "a rotor needs at least one arm with a nozzle",
            );
        }
        let mut arms = Vec::with_capacity(r.arms.len());
        for (i, arm) in r.arms.iter().enumerate() {
            let arm_index = Some(i);
            let p = |input: &Input| input.path_at(arm_index);
            let radius_m = c.input(&cat::RADIUS, arm_index, arm.radius);
            if radius_m > 0.0 && hub_radius_m >= radius_m {
                c.push(
                    &p(&cat::RADIUS),
                    arm.radius,
                    format!(
                        "must be larger than rotor.hub_radius = {}: the arm must reach past the hub",
                        r.hub_radius
                    ),
                );
            }
            let bore_m = c.input(&cat::TUBE_BORE, arm_index, arm.tube.bore);
            let outer_m = c.input(&cat::TUBE_OUTER, arm_index, arm.tube.outer);
            if bore_m > 0.0 && outer_m > 0.0 && outer_m <= bore_m {
                c.push(
                    &p(&cat::TUBE_OUTER),
                    arm.tube.outer,
                    format!(
                        "must be larger than the bore {}: a tube's outside is wider than its inside",
                        arm.tube.bore
                    ),
                );
            }
            let roughness_m = c.input(&cat::TUBE_ROUGHNESS, arm_index, arm.tube.roughness);
            if bore_m > 0.0 && roughness_m >= bore_m / 2.0 {
                c.push(
                    &p(&cat::TUBE_ROUGHNESS),
                    arm.tube.roughness,
                    format!("must be smaller than half the bore {}", arm.tube.bore),
                );
            }
            let length_m = arm.tube.length.map(|l| {
                let len = c.input(&cat::TUBE_LENGTH, arm_index, l);
                let span = radius_m - hub_radius_m;
                if len > 0.0 && span > 0.0 && len < span * (1.0 - 1e-9) {
                    c.push(
                        &p(&cat::TUBE_LENGTH),
                        l,
                        format!(
                            "must be at least the radius minus the hub radius ({} − {}): the tube reaches from the hub to the nozzle",
                            arm.radius, r.hub_radius
                        ),
                    );
                }
                len
            });
            let diameter_m = c.input(&cat::NOZZLE_DIAMETER, arm_index, arm.nozzle.diameter);
            // (10⁻⁹ slack: a nozzle as wide as its tube, saved in other units, reads back)
            if diameter_m > 0.0 && bore_m > 0.0 && diameter_m > bore_m * (1.0 + 1e-9) {
                c.push(
                    &p(&cat::NOZZLE_DIAMETER),
                    arm.nozzle.diameter,
                    format!(
                        "is wider than the tube bore {}: a nozzle can be at most as wide as its tube",
                        arm.tube.bore
                    ),
                );
            }
            arms.push(d::Arm {
                radius_m,
                azimuth_rad: c.input(&cat::AZIMUTH, arm_index, arm.azimuth),
                height_m: c.input(&cat::HEIGHT, arm_index, arm.height),
                rise_m: arm
                    .rise
                    .map_or(0.0, |rise| c.input(&cat::RISE, arm_index, rise)),
                tube: d::Tube {
                    bore_m,
                    outer_m,
                    roughness_m,
                    minor_k: c.input(&cat::TUBE_MINOR_K, arm_index, arm.tube.minor_k),
                    length_m,
                },
                nozzle: d::Nozzle {
                    diameter_m,
                    elevation_rad: c.input(&cat::ELEVATION, arm_index, arm.nozzle.elevation),
                    deflection_rad: c.input(&cat::DEFLECTION, arm_index, arm.nozzle.deflection),
                    cd: c.input(&cat::NOZZLE_CD, arm_index, arm.nozzle.cd),
                    cv: c.input(&cat::NOZZLE_CV, arm_index, arm.nozzle.cv),
                },
            });
        }

        let inertia = match r.inertia {
            schema::Inertia::Given(i) => d::Inertia::Given {
                kg_m2: c.input(&cat::INERTIA_GIVEN, None, i),
            },
            schema::Inertia::Estimate {
                tube_density,
                tube_wall,
                tip_mass,
            } => {
                let wall_path = cat::TUBE_WALL.path;
                let tube_wall_m = c.input(&cat::TUBE_WALL, None, tube_wall);
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
                    tube_density_kg_m3: c.input(&cat::TUBE_DENSITY, None, tube_density),
                    tube_wall_m,
                    tip_mass_kg: c.input(&cat::TIP_MASS, None, tip_mass),
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
                let inner_m = c.input(&cat::WASHER_INNER, None, inner);
                let outer_m = c.input(&cat::WASHER_OUTER, None, outer);
                if outer_m > 0.0 && inner_m >= outer_m {
                    c.push(
                        cat::WASHER_INNER.path,
                        inner,
                        format!("must be smaller than the outer radius {outer}"),
                    );
                }
                d::Bearing::Washer(d::Washer {
                    mu_kinetic: c.input(&cat::MU_KINETIC, None, mu_kinetic),
                    mu_static: c.input(&cat::MU_STATIC, None, mu_static),
                    inner_m,
                    outer_m,
                    thrust_area_m2: c.input(&cat::THRUST_AREA, None, thrust_area),
                    rotor_mass_kg: c.input(&cat::ROTOR_MASS, None, rotor_mass),
                    radius_rule: match radius_rule {
                        schema::WasherRule::UniformWear => d::WasherRule::UniformWear,
                        schema::WasherRule::UniformPressure => d::WasherRule::UniformPressure,
                    },
                })
            }
            schema::Bearing::Measured { running, breakaway } => d::Bearing::Measured {
                running_n_m: c.input(&cat::RUNNING, None, running),
                breakaway_n_m: c.input(&cat::BREAKAWAY, None, breakaway),
            },
        };
        d::Friction {
            bearing,
            seal: d::Seal {
                base_n_m: c.input(&cat::SEAL_BASE, None, f.seal.base),
                // The file gives torque per kPa; the design per Pa.
                per_pa_n_m: c.input(&cat::SEAL_PER_PRESSURE, None, f.seal.per_kpa) / 1.0e3,
            },
            brake: d::Brake {
                viscous: c.input(&cat::BRAKE_VISCOUS, None, f.brake.viscous),
                quadratic: c.input(&cat::BRAKE_QUADRATIC, None, f.brake.quadratic),
            },
            arm_drag_cd: c.input(&cat::ARM_DRAG_CD, None, f.arm_drag_cd),
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
        let d50_m = size(cat::D50.path, s.d50);
        let largest_m = size(cat::LARGEST.path, s.largest);
        if let (Some(d50), Some(largest)) = (d50_m, largest_m) {
            if d50 > 0.0 && largest > 0.0 && largest <= d50 {
                c.push(
                    cat::LARGEST.path,
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
            Spread::Value(n) => Some(c.input(&cat::SPREAD, None, n)),
        };
        let breakup = match s.breakup {
            Breakup::Auto => None,
            Breakup::Value(b) => Some(c.input(&cat::BREAKUP, None, b)),
        };
        d::SpraySpec {
            d50_m,
            spread,
            largest_m,
            breakup,
        }
    }
}
