//! Random valid designs inside the validation ranges.

use super::*;

/// Draws values from a list of uniform numbers in [0, 1): a tenth of draws
/// land exactly on a range's ends.
pub(super) struct Draw<'a> {
    u: &'a [f64],
    next: usize,
}

impl Draw<'_> {
    fn unit(&mut self) -> f64 {
        let v = self.u.get(self.next % self.u.len().max(1)).copied();
        self.next += 1;
        v.unwrap_or(0.5)
    }
    fn t(&mut self) -> f64 {
        let u = self.unit();
        if u < 0.05 {
            0.0
        } else if u >= 0.95 {
            1.0
        } else {
            (u - 0.05) / 0.9
        }
    }
    fn lin(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.t()
    }
    /// Log-uniform on [lo, hi], lo > 0.
    fn log(&mut self, lo: f64, hi: f64) -> f64 {
        lo * (hi / lo).powf(self.t())
    }
    fn pick(&mut self, n: usize) -> usize {
        ((self.unit() * n as f64) as usize).min(n - 1)
    }
    fn chance(&mut self, p: f64) -> bool {
        self.unit() < p
    }
}

pub(super) const DEG: f64 = std::f64::consts::PI / 180.0;

pub(super) fn build_design(u: &[f64]) -> Design {
    let mut d = Draw { u, next: 0 };
    let count = 1 + d.pick(12);
    let same = d.chance(0.5);
    let mut arms = Vec::new();
    let mut template: Option<Arm> = None;
    for k in 0..count {
        if let (true, Some(t)) = (same, &template) {
            let mut a = *t;
            a.azimuth_rad = 2.0 * std::f64::consts::PI * k as f64 / count as f64;
            arms.push(a);
            continue;
        }
        let nozzle_m = d.log(0.5e-3, 10e-3);
        let bore_m = nozzle_m * d.lin(1.0, 4.0);
        let outer_m = bore_m * d.lin(1.05, 2.0);
        let arm = Arm {
            radius_m: d.log(0.02, 2.0),
            azimuth_rad: d.lin(0.0, 2.0 * std::f64::consts::PI),
            height_m: d.lin(0.0, 2.0),
            rise_m: d.lin(-0.3, 0.3),
            tube: Tube {
                bore_m,
                outer_m,
                roughness_m: bore_m * d.lin(0.0, 0.05),
                minor_k: d.lin(0.0, 5.0),
                length_m: None,
            },
            nozzle: Nozzle {
                diameter_m: nozzle_m,
                elevation_rad: d.lin(0.0, 90.0) * DEG,
                deflection_rad: if d.chance(0.5) {
                    d.lin(-30.0, 60.0) * DEG
                } else {
                    d.lin(-180.0, 180.0) * DEG
                },
                cd: d.lin(0.3, 1.0),
                cv: d.lin(0.3, 1.0),
            },
        };
        template = Some(arm);
        arms.push(arm);
    }
    let r_min = arms
        .iter()
        .map(|a| a.radius_m)
        .fold(f64::INFINITY, f64::min);
    let hub_radius_m = r_min * d.lin(0.0, 0.9);
    for a in &mut arms {
        if d.chance(0.3) {
            a.tube.length_m = Some((a.radius_m - hub_radius_m) * d.lin(1.0, 3.0));
        }
    }
    let thinnest_outer = arms
        .iter()
        .map(|a| a.tube.outer_m)
        .fold(f64::INFINITY, f64::min);
    let supply = match d.pick(3) {
        0 => Supply::Pressure {
            inlet_pa: d.log(10e3, 1e6),
        },
        1 => {
            // A flow the nozzles can pass (model.md M4 refuses more).
            let total_m3_s = d.log(1e-6, 5e-3);
            let open: f64 = arms
                .iter()
                .map(|a| a.nozzle.cd * std::f64::consts::PI * a.nozzle.diameter_m.powi(2) / 4.0)
                .sum();
            let most = open * (2.0 * 1.9e6 / 1000.0f64).sqrt();
            Supply::Flow {
                total_m3_s: total_m3_s.min(most),
            }
        }
        _ => Supply::Line(Line {
            source_pa: d.log(10e3, 1e6),
            length_m: d.log(0.1, 100.0),
            bore_m: d.log(5e-3, 50e-3),
            roughness_m: d.lin(0.0, 1e-4),
            minor_k: d.lin(0.0, 20.0),
            lift_m: d.lin(-10.0, 10.0),
        }),
    };
    let inertia = if d.chance(0.5) {
        Inertia::Given {
            kg_m2: d.log(1e-6, 10.0),
        }
    } else {
        Inertia::Estimate {
            tube_density_kg_m3: d.log(900.0, 9000.0),
            tube_wall_m: thinnest_outer / 2.0 * d.lin(0.01, 1.0),
            tip_mass_kg: d.lin(0.0, 0.1),
        }
    };
    let bearing = if d.chance(0.5) {
        let outer_m = d.log(1e-3, 30e-3);
        Bearing::Washer(Washer {
            mu_kinetic: d.lin(0.0, 0.6),
            mu_static: d.lin(0.0, 0.8),
            inner_m: outer_m * d.lin(0.0, 0.95),
            outer_m,
            thrust_area_m2: d.lin(0.0, 1e-3),
            rotor_mass_kg: d.log(0.01, 10.0),
            radius_rule: if d.chance(0.5) {
                WasherRule::UniformWear
            } else {
                WasherRule::UniformPressure
            },
        })
    } else {
        Bearing::Measured {
            running_n_m: d.lin(0.0, 0.5),
            breakaway_n_m: d.lin(0.0, 1.0),
        }
    };
    let friction = Friction {
        bearing,
        seal: Seal {
            base_n_m: d.lin(0.0, 0.05),
            per_pa_n_m: d.lin(0.0, 1e-7),
        },
        brake: Brake {
            viscous: if d.chance(0.5) { d.lin(0.0, 5.0) } else { 0.0 },
            quadratic: if d.chance(0.3) { d.lin(0.0, 1.0) } else { 0.0 },
        },
        arm_drag_cd: d.lin(0.0, 2.0),
    };
    let spray = if d.chance(0.6) {
        SpraySpec::default()
    } else {
        let d50 = d.log(0.2e-3, 3e-3);
        SpraySpec {
            d50_m: d.chance(0.7).then_some(d50),
            spread: d.chance(0.5).then(|| d.lin(1.0, 6.0)),
            largest_m: d.chance(0.5).then(|| d50 * d.lin(1.1, 4.0)),
            breakup: d.chance(0.5).then(|| d.lin(2.0, 22.0)),
        }
    };
    let layout = match d.pick(4) {
        0 => None,
        1 => Some(Layout::Square {
            spacing_m: d.log(0.5, 40.0),
        }),
        2 => Some(Layout::Rectangle {
            spacing_m: d.log(0.5, 40.0),
            rows_m: d.log(0.5, 40.0),
        }),
        _ => Some(Layout::Triangle {
            spacing_m: d.log(0.5, 40.0),
        }),
    };
    let wind = if d.chance(0.6) {
        Wind::default()
    } else {
        Wind {
            speed_m_s: d.lin(0.0, 10.0),
            from_rad: d.lin(-360.0, 360.0) * DEG,
        }
    };
    Design {
        name: "fuzz design".to_string(),
        water_temperature_c: d.lin(0.0, 50.0),
        site: Site {
            air_temperature_c: d.lin(-40.0, 60.0),
            altitude_m: d.lin(-500.0, 11_000.0),
            clearance_m: None,
        },
        supply,
        rotor: Rotor {
            hub_radius_m,
            swivel: Swivel {
                inlet_bore_m: d.log(3e-3, 50e-3),
                k: d.lin(0.0, 10.0),
            },
            arms,
            inertia,
        },
        friction,
        spray,
        layout,
        wind,
    }
}

pub(super) fn designs() -> impl Strategy<Value = Vec<f64>> {
    prop::collection::vec(0.0f64..1.0, 64..160)
}

/// A random design through the physics, and through a save and reload.
pub(super) fn check_random_design(u: &[f64]) -> Result<(), String> {
    let design = build_design(u);
    check_saves(&design)?;
    let text = Scenario::from_design(&design, UnitSystem::Metric, "").to_ron_string();
    check_design(&design)
        .and_then(|()| check_cli(&text, &design.name, design.layout.is_some()))
        .map_err(|e| format!("{e}\n{text}"))
}
