//! Practice checks: a design that solves but that a practitioner would
//! question.
//!
//! The spin solver's own [`Warning`](super::balance::Warning)s say when the
//! model met a physical state (a dry nozzle, no equilibrium). These checks
//! compare a solved design against rules of thumb instead, and return typed
//! [`Caution`]s with the numbers behind them; the words are the report
//! layer's (`crate::words`). Every rule and its source is in [`Rules`]:
//!
//! | caution | rule | source |
//! |---|---|---|
//! | [`Caution::LowStartMargin`] | stall torque / breakaway torque < 1.5 | common practice: wear, grit and low pressure eat a thin margin |
//! | [`Caution::FastSpin`] | more than 600 rpm | common practice: rotating-arm sprinklers run at tens to a few hundred rpm; a plain thrust washer wears fast above that |
//! | [`Caution::FastTip`] | arm tip above 10 m/s | common practice: the tip speed of a braked garden or field rotor is a few m/s; above 10 m/s the arms and tip masses load the hub hard and the jets break up into mist |
//! | [`Caution::SpinPressure`] | a nozzle's gauge pressure above 1.5 × the inlet's | the centrifugal rise ρω²r²/2 (model.md M3) has outgrown the supply: the speed, not the tap, sets the flow |
//! | [`Caution::QuickSpinUp`] | 90 % of the speed in under 0.1 s | common practice: a real rotor takes a visible fraction of a second or more; faster usually means the inertia is too small (tip masses, the brake's rotor, the water in the arms left out) |
//! | [`Caution::AboveClearance`] | a drop path's peak above the stated overhead clearance | the clearance the user states (wires, branches, a roof) |

use super::balance::{rpm, SpinReport, SpinStatus};
use super::coverage::{flight_env, HeadThrow};
use super::design::Design;
use super::trajectory::{fly_jet, FlightOptions};

/// The limits the checks use. [`Rules::default`] holds the documented values.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Rules {
    /// Smallest start margin (stall over breakaway torque) taken as safe: 1.5.
    pub min_start_margin: f64,
    /// Highest plausible speed, rpm: 600.
    pub max_rpm: f64,
    /// Highest plausible tip speed of the longest arm, m/s: 10.
    pub max_tip_speed_m_s: f64,
    /// Highest nozzle gauge pressure over inlet gauge pressure: 1.5.
    pub max_spin_pressure_ratio: f64,
    /// Shortest plausible time to 90 % of the operating speed, s: 0.1.
    pub min_spin_up_s: f64,
    /// Height of the lowest thing overhead, m, when stated.
    pub clearance_m: Option<f64>,
}

impl Default for Rules {
    fn default() -> Self {
        Rules {
            min_start_margin: 1.5,
            max_rpm: 600.0,
            max_tip_speed_m_s: 10.0,
            max_spin_pressure_ratio: 1.5,
            min_spin_up_s: 0.1,
            clearance_m: None,
        }
    }
}

impl Rules {
    /// The documented rules with the design's overhead clearance.
    pub fn for_design(design: &Design) -> Self {
        Rules {
            clearance_m: design.site.clearance_m,
            ..Rules::default()
        }
    }
}

/// A solved design a practitioner would question, with the numbers.
#[derive(Debug, Clone, PartialEq)]
pub enum Caution {
    /// It starts, but with a thin margin.
    LowStartMargin {
        /// Stall over breakaway torque.
        margin: f64,
        /// The rule's smallest margin.
        min: f64,
    },
    /// It spins faster than such sprinklers run.
    FastSpin {
        /// Operating speed, rpm.
        rpm: f64,
        /// The rule's highest speed, rpm.
        max_rpm: f64,
    },
    /// Its arm tips move faster than such a construction plausibly takes.
    FastTip {
        /// Tip speed of the longest arm, m/s.
        tip_speed_m_s: f64,
        /// The rule's highest tip speed, m/s.
        max_m_s: f64,
    },
    /// Spin has raised a nozzle's pressure far above the supply's.
    SpinPressure {
        /// The arm (from 0) with the highest nozzle pressure.
        arm: usize,
        /// Its nozzle gauge pressure, Pa.
        nozzle_pa: f64,
        /// Inlet gauge pressure, Pa.
        inlet_pa: f64,
        /// The rule's highest ratio.
        max_ratio: f64,
    },
    /// It comes up to speed implausibly fast: the inertia is likely wrong.
    QuickSpinUp {
        /// Time to 90 % of the operating speed, s.
        t90_s: f64,
        /// The rule's shortest time, s.
        min_s: f64,
        /// The rotor inertia used, kg·m².
        inertia_kg_m2: f64,
    },
    /// A jet rises above the stated overhead clearance.
    AboveClearance {
        /// The arm (from 0) with the highest drop path.
        arm: usize,
        /// Peak height of its highest drop path above ground, m.
        peak_m: f64,
        /// The stated clearance, m.
        clearance_m: f64,
    },
}

impl Caution {
    /// A short machine name (for JSON and tests).
    pub fn key(&self) -> &'static str {
        match self {
            Caution::LowStartMargin { .. } => "low_start_margin",
            Caution::FastSpin { .. } => "fast_spin",
            Caution::FastTip { .. } => "fast_tip",
            Caution::SpinPressure { .. } => "spin_pressure",
            Caution::QuickSpinUp { .. } => "quick_spin_up",
            Caution::AboveClearance { .. } => "above_clearance",
        }
    }
}

/// The practice checks of a solved design. `peaks_m` holds the peak height
/// above ground of each arm's highest drop path (None for a dry nozzle), when
/// the throw was computed; the clearance check needs it.
pub fn cautions(
    design: &Design,
    report: &SpinReport,
    peaks_m: Option<&[Option<f64>]>,
    rules: &Rules,
) -> Vec<Caution> {
    let mut out = Vec::new();
    if let Some(m) = report.start_margin {
        // Below 1 it does not start at all: the status says so already.
        if m >= 1.0 && m < rules.min_start_margin && report.status == SpinStatus::Running {
            out.push(Caution::LowStartMargin {
                margin: m,
                min: rules.min_start_margin,
            });
        }
    }
    if let Some(op) = &report.operating {
        let w = op.omega_rad_s();
        let speed = rpm(w);
        if speed > rules.max_rpm {
            out.push(Caution::FastSpin {
                rpm: speed,
                max_rpm: rules.max_rpm,
            });
        }
        let r_max = design.rotor.tip_radius_m();
        let tip = w * r_max;
        if tip > rules.max_tip_speed_m_s {
            out.push(Caution::FastTip {
                tip_speed_m_s: tip,
                max_m_s: rules.max_tip_speed_m_s,
            });
        }
        let state = &op.point.state;
        let inlet = state.inlet_pressure_pa;
        let worst = state
            .nozzles
            .iter()
            .enumerate()
            .map(|(k, n)| (k, n.nozzle_pressure_pa))
            .filter(|(_, p)| p.is_finite())
            // The first of equal ones: arm 1 of a symmetric rotor.
            .reduce(|a, b| if b.1 > a.1 { b } else { a });
        if let Some((arm, p)) = worst {
            if inlet > 0.0 && p > rules.max_spin_pressure_ratio * inlet {
                out.push(Caution::SpinPressure {
                    arm,
                    nozzle_pa: p,
                    inlet_pa: inlet,
                    max_ratio: rules.max_spin_pressure_ratio,
                });
            }
        }
    }
    if let Some(s) = report.spin_up {
        if s.t90_s < rules.min_spin_up_s {
            out.push(Caution::QuickSpinUp {
                t90_s: s.t90_s,
                min_s: rules.min_spin_up_s,
                inertia_kg_m2: report.inertia_kg_m2,
            });
        }
    }
    if let (Some(clearance), Some(peaks)) = (rules.clearance_m, peaks_m) {
        let highest = peaks
            .iter()
            .enumerate()
            .filter_map(|(k, p)| p.map(|p| (k, p)))
            // The first of equal ones: arm 1 of a symmetric rotor.
            .reduce(|a, b| if b.1 > a.1 { b } else { a });
        if let Some((arm, peak)) = highest {
            if peak > clearance {
                out.push(Caution::AboveClearance {
                    arm,
                    peak_m: peak,
                    clearance_m: clearance,
                });
            }
        }
    }
    out
}

/// Peak height above ground, m, of each arm's highest drop path: the largest
/// drop of its spectrum (the one drag slows least), flown in still air from
/// the jet at the spin state of `head`. None for a dry nozzle or a failed flight.
pub fn peak_heights_m(
    design: &Design,
    head: &HeadThrow,
    flight: &FlightOptions,
) -> Vec<Option<f64>> {
    let env = flight_env(design).still();
    head.spraying
        .jets
        .iter()
        .enumerate()
        .map(|(k, jet)| {
            let largest = head.throw.nozzles.get(k)?.as_ref()?.spectrum.largest_m;
            fly_jet(jet, largest, &env, flight)
                .ok()
                .map(|l| l.apex_m.max(jet.position_m.z))
        })
        .collect()
}

/// The practice checks of a solved design under its own [`Rules`]
/// ([`Rules::for_design`]). The drop paths are flown (with `flight`) for
/// their peak height only when the design states an overhead clearance and
/// its throw `head` was computed; without them the clearance check is left out.
pub fn practice_cautions(
    design: &Design,
    report: &SpinReport,
    head: Option<&HeadThrow>,
    flight: &FlightOptions,
) -> Vec<Caution> {
    let rules = Rules::for_design(design);
    let peaks = match (rules.clearance_m, head) {
        (Some(_), Some(h)) => Some(peak_heights_m(design, h, flight)),
        _ => None,
    };
    cautions(design, report, peaks.as_deref(), &rules)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::balance::solve;
    use crate::physics::design::{Bearing, Brake, Inertia};
    use crate::physics::fixtures;

    fn keys(c: &[Caution]) -> Vec<&'static str> {
        c.iter().map(Caution::key).collect()
    }

    fn checked(d: &Design, peaks: Option<&[Option<f64>]>, rules: &Rules) -> Vec<Caution> {
        cautions(d, &solve(d), peaks, rules)
    }

    /// A braked two-arm rotor that passes every check.
    fn calm() -> Design {
        let d = fixtures::three_arm_rotor();
        let r = solve(&d);
        let c = cautions(&d, &r, None, &Rules::default());
        assert!(
            c.is_empty(),
            "{c:?} at {:?}",
            r.operating.map(|o| rpm(o.omega_rad_s()))
        );
        d
    }

    #[test]
    fn a_fast_unbraked_rotor_trips_speed_tip_and_pressure() {
        let mut d = calm();
        d.friction.brake = Brake::default();
        d.friction.bearing = Bearing::Measured {
            running_n_m: 0.001,
            breakaway_n_m: 0.002,
        };
        for arm in &mut d.rotor.arms {
            arm.nozzle.deflection_rad = 0.0;
        }
        let c = checked(&d, None, &Rules::default());
        let k = keys(&c);
        assert!(k.contains(&"fast_spin"), "{c:?}");
        assert!(k.contains(&"fast_tip"), "{c:?}");
        assert!(k.contains(&"spin_pressure"), "{c:?}");
        for x in &c {
            match *x {
                Caution::FastSpin { rpm, max_rpm } => assert!(rpm > max_rpm),
                Caution::FastTip {
                    tip_speed_m_s,
                    max_m_s,
                } => assert!(tip_speed_m_s > max_m_s),
                Caution::SpinPressure {
                    nozzle_pa,
                    inlet_pa,
                    max_ratio,
                    ..
                } => assert!(nozzle_pa > max_ratio * inlet_pa),
                _ => {}
            }
        }
    }

    #[test]
    fn a_thin_start_margin_trips() {
        let d = calm();
        let r = solve(&d);
        let stall = r.stall_torque_n_m;
        let mut thin = d.clone();
        // Breakaway torque at 1/1.2 of the stall torque: margin 1.2.
        thin.friction.bearing = Bearing::Measured {
            running_n_m: 0.5 * stall / 1.2,
            breakaway_n_m: stall / 1.2,
        };
        let c = checked(&thin, None, &Rules::default());
        match c.iter().find(|c| c.key() == "low_start_margin") {
            Some(Caution::LowStartMargin { margin, min }) => {
                assert!((margin - 1.2).abs() < 1e-6, "{margin}");
                assert_eq!(*min, 1.5);
            }
            other => panic!("{other:?} in {c:?}"),
        }
        // A margin of 2 is quiet.
        let mut fine = d;
        fine.friction.bearing = Bearing::Measured {
            running_n_m: 0.25 * stall,
            breakaway_n_m: 0.5 * stall,
        };
        assert!(!keys(&checked(&fine, None, &Rules::default())).contains(&"low_start_margin"));
    }

    #[test]
    fn a_featherweight_rotor_trips_the_spin_up_check() {
        let mut d = calm();
        d.rotor.inertia = Inertia::Given { kg_m2: 1e-6 };
        let c = checked(&d, None, &Rules::default());
        match c.iter().find(|c| c.key() == "quick_spin_up") {
            Some(Caution::QuickSpinUp {
                t90_s,
                min_s,
                inertia_kg_m2,
            }) => {
                assert!(t90_s < min_s);
                assert_eq!(*inertia_kg_m2, 1e-6);
            }
            other => panic!("{other:?} in {c:?}"),
        }
    }

    #[test]
    fn a_jet_above_the_stated_clearance_trips() {
        let d = calm();
        let peaks = [Some(2.5), Some(3.1), None];
        let rules = Rules {
            clearance_m: Some(3.0),
            ..Rules::default()
        };
        let c = checked(&d, Some(&peaks), &rules);
        assert_eq!(
            c,
            vec![Caution::AboveClearance {
                arm: 1,
                peak_m: 3.1,
                clearance_m: 3.0
            }]
        );
        // Quiet with no clearance stated, or a clearance above the peaks.
        assert!(checked(&d, Some(&peaks), &Rules::default()).is_empty());
        let high = Rules {
            clearance_m: Some(3.2),
            ..Rules::default()
        };
        assert!(checked(&d, Some(&peaks), &high).is_empty());
    }

    #[test]
    fn the_peak_height_is_below_the_drag_free_bound() {
        use crate::physics::coverage::head_throw;
        use crate::physics::pattern::PatternOptions;
        let d = calm();
        let r = solve(&d);
        let opts = PatternOptions::default();
        let head = head_throw(&d, &r, &opts, None).unwrap();
        let peaks = peak_heights_m(&d, &head, &opts.flight);
        assert_eq!(peaks.len(), d.rotor.arms.len());
        for (k, p) in peaks.iter().enumerate() {
            let jet = &head.spraying.jets[k];
            let p = p.unwrap();
            // Drag only lowers the apex: z0 + w²/2g is an upper bound
            // (projectile motion, any mechanics text), the nozzle a lower one.
            let g = 9.80665;
            let bound = jet.position_m.z + jet.velocity_m_s.z.powi(2) / (2.0 * g);
            assert!(p > jet.position_m.z && p <= bound + 1e-9, "{p} vs {bound}");
        }
    }
}
