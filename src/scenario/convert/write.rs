//! A design written back as file values, each SI value with the tag a
//! practitioner in the chosen unit system would use.

use crate::physics::design::{self as d, Design};
use crate::scenario::schema::{self, Breakup, DropSize, Scenario, Spread, FORMAT_VERSION};
use crate::scenario::tags::{
    Angle, Area, Density, FlowRate, Length, Mass, MomentOfInertia, Pressure, Speed, Temperature,
    Torque,
};
use crate::units::UnitSystem;

impl Scenario {
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
                breakup: design.spray.breakup.map_or(Breakup::Auto, Breakup::Value),
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
