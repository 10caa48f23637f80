//! Editing the design: every change builds a candidate and keeps it only
//! when it passes a scenario file's validation; nudging, typing, and the
//! arms (add, remove, copy to all, together or apart).

use super::{App, Input, InputTarget, Measure, Mode};
use crate::catalogue;
use crate::physics::design::{Arm, Design, Washer, WasherRule};
use crate::scenario::{Scenario, ScenarioError};
use crate::tui::fields::{self, Arms, ChoiceHint, Field, Kind, Stride};
use crate::units::{self, Dimension as D};

impl App {
    /// Validates a candidate design as a file would be and keeps it, or
    /// refuses it with the reason. Returns true when kept.
    pub(super) fn apply(&mut self, candidate: Design) -> bool {
        match Scenario::from_design(&candidate, self.units, &self.notes).to_design() {
            Ok(valid) => {
                let before = std::mem::replace(&mut self.design, valid);
                self.history.kept(before);
                self.dirty = true;
                self.resolve();
                true
            }
            Err(e) => {
                self.refuse(&e);
                false
            }
        }
    }

    pub(super) fn refuse(&mut self, e: &ScenarioError) {
        let problems = e.problems();
        let text = if problems.is_empty() {
            e.to_string()
        } else {
            problems
                .iter()
                .map(|p| format!("{} ({} = {})", p.rule, p.path, p.value))
                .collect::<Vec<_>>()
                .join("; ")
        };
        self.error(format!("refused, value kept: {text}"));
    }

    pub(super) fn hint(&self) -> ChoiceHint {
        let state = self.report.described_state();
        let running = self
            .report
            .operating
            .as_ref()
            .map_or(self.report.breakaway_torque_n_m, |op| {
                op.point.resist.bearing_n_m
            });
        ChoiceHint {
            inlet_pa: state.inlet_pressure_pa.max(1.0e3),
            flow_m3_s: state.total_flow_m3_s.max(1.0e-6),
            inertia_kg_m2: self.report.inertia_kg_m2.max(1.0e-6),
            running_n_m: running.max(1.0e-4),
            breakaway_n_m: self.report.breakaway_torque_n_m.max(running).max(1.0e-4),
            // A plastic-on-brass washer like the shipped scenarios' (common practice).
            washer: Washer {
                mu_kinetic: 0.10,
                mu_static: 0.15,
                inner_m: 4.0e-3,
                outer_m: 8.0e-3,
                thrust_area_m2: 110.0e-6,
                rotor_mass_kg: 0.25,
                radius_rule: WasherRule::UniformWear,
            },
            spacing_m: self
                .spray
                .as_ref()
                .and_then(|s| s.wetted_radius_m())
                .filter(|r| *r > 0.5)
                .map_or(8.0, |r| (r * 10.0).round() / 10.0),
        }
    }

    pub(super) fn nudge(&mut self, forward: bool, stride: Stride) {
        let Some(f) = self.selected_field() else {
            return;
        };
        let mut cand = self.design.clone();
        match f.kind() {
            Kind::Choice => {
                if f.cycle(&mut cand, forward, &self.hint()) {
                    self.apply(cand);
                }
            }
            Kind::Text => {}
            Kind::Number | Kind::OptionalNumber => {
                let now = f.number(&self.design).or_else(|| self.auto_value(f));
                let Some(v) = now else { return };
                let next = fields::nudged(f, v, self.units, forward, stride);
                if f.set_number(&mut cand, Some(next)) {
                    self.apply(cand);
                }
            }
        }
    }

    /// What the model uses for an `auto` spray value (to nudge from).
    pub(super) fn auto_value(&self, f: Field) -> Option<f64> {
        let spec = self
            .spray
            .as_ref()
            .and_then(|s| s.throw.as_ref().ok())
            .and_then(|t| t.nozzles.iter().flatten().next())
            .map(|n| &n.spectrum);
        let input = f.input;
        if input == &catalogue::D50 {
            Some(spec.map_or(1.5e-3, |s| s.d50_m))
        } else if input == &catalogue::SPREAD {
            Some(spec.map_or(2.5, |s| s.spread))
        } else if input == &catalogue::LARGEST {
            Some(spec.map_or(4.0e-3, |s| s.largest_m))
        } else {
            None
        }
    }

    pub(super) fn start_typing(&mut self) {
        let Some(f) = self.selected_field() else {
            return;
        };
        if f.kind() == Kind::Choice {
            self.nudge(true, Stride::Fine);
            return;
        }
        self.start_input(InputTarget::Field(f));
    }

    pub(super) fn start_input(&mut self, target: InputTarget) {
        let text = match target {
            InputTarget::Field(f) => f.typing_seed(&self.design, self.units),
            InputTarget::SaveAs => self.suggested_name().display().to_string(),
            InputTarget::Measured(Measure::Pressure) => self
                .measured
                .pressure_pa
                .map(|v| seed(D::Pressure, v, self.units))
                .unwrap_or_default(),
            InputTarget::Measured(Measure::Throw) => self
                .measured
                .throw_m
                .map(|v| seed(D::Length, v, self.units))
                .unwrap_or_default(),
            InputTarget::Measured(Measure::Coast) => self.turn_times_seed(),
            InputTarget::Measured(Measure::Rotation | Measure::Flow) | InputTarget::Goal(_) => {
                String::new()
            }
        };
        self.mode = Mode::Typing(Input { target, text });
    }

    /// Sets a field from typed text (with its unit); refuses with the reason.
    pub fn type_value(&mut self, f: Field, text: &str) -> bool {
        let mut cand = self.design.clone();
        if f.input == &catalogue::NAME {
            let name = text.trim();
            if name.is_empty() {
                self.error("refused, value kept: the name must not be empty");
                return false;
            }
            cand.name = name.to_string();
            return self.apply(cand);
        }
        match fields::parse_typed(f, text, self.units) {
            Ok(v) => {
                if f.set_number(&mut cand, v) {
                    self.apply(cand)
                } else {
                    false
                }
            }
            Err(e) => {
                self.error(format!("refused, value kept: {}", e.0));
                false
            }
        }
    }

    pub(super) fn add_arm(&mut self) {
        let k = self.selected_field().and_then(Field::arm).unwrap_or(0);
        let Some(arm) = self.design.rotor.arms.get(k).copied() else {
            return;
        };
        if self.design.rotor.arms.len() >= 12 {
            self.error("twelve arms is the most this list takes");
            return;
        }
        let mut cand = self.design.clone();
        cand.rotor.arms.insert(k + 1, arm);
        fields::respace(&mut cand);
        let n = cand.rotor.arms.len();
        if !self.apply(cand) {
            return;
        }
        if self.arms == Arms::Together {
            self.info(format!(
                "added an arm like the others: {n} arms, evenly spread"
            ));
        } else {
            self.select(Field::on_arm(&catalogue::NOZZLE_DIAMETER, k + 1));
            self.info(format!(
                "added arm {} (a copy of arm {}); arms respaced evenly",
                k + 2,
                k + 1
            ));
        }
    }

    pub(super) fn remove_arm(&mut self) {
        let together = self.arms == Arms::Together;
        let k = match self.selected_field() {
            // With the arms together the last one goes (they are alike).
            Some(f) if together && f.input.per_arm() => {
                self.design.rotor.arms.len().saturating_sub(1)
            }
            Some(f) => match f.arm() {
                Some(k) => k,
                None => {
                    self.error("select a field of the arm to remove");
                    return;
                }
            },
            None => return,
        };
        if self.design.rotor.arms.len() <= 1 {
            self.error("a rotor needs at least one arm");
            return;
        }
        let mut cand = self.design.clone();
        cand.rotor.arms.remove(k);
        fields::respace(&mut cand);
        let n = cand.rotor.arms.len();
        if self.apply(cand) {
            if together {
                self.info(format!("removed an arm: {n} left, evenly spread"));
            } else {
                self.select(Field::on_arm(&catalogue::NOZZLE_DIAMETER, k.min(n - 1)));
                self.info(format!("removed arm {}; arms respaced evenly", k + 1));
            }
        }
    }

    /// Makes every arm a copy of the selected one: radius, height, rise,
    /// tube and nozzle; each arm keeps its azimuth.
    pub(super) fn copy_arm_to_all(&mut self) {
        if self.arms == Arms::Together {
            self.info("the arms are edited together and alike already (a splits them)");
            return;
        }
        let Some(k) = self.selected_field().and_then(Field::arm) else {
            self.error("select a field of the arm to copy to every arm");
            return;
        };
        let Some(from) = self.design.rotor.arms.get(k).copied() else {
            return;
        };
        let mut cand = self.design.clone();
        for a in &mut cand.rotor.arms {
            *a = Arm {
                azimuth_rad: a.azimuth_rad,
                ..from
            };
        }
        if self.apply(cand) {
            let join = if fields::arms_alike(&self.design).is_ok() {
                "; a joins them into one block"
            } else {
                ""
            };
            self.info(format!(
                "arm {} copied to every arm (radius, height, rise, tube, nozzle; azimuths kept){join}",
                k + 1
            ));
        }
    }

    /// Splits the arms into blocks of their own, or joins them into one
    /// block when they are alike (refused, saying what differs, when not).
    pub(super) fn toggle_arms(&mut self) {
        match self.arms {
            Arms::Together => {
                self.arms = Arms::Apart;
                self.refresh_rows();
                self.info("arms apart: each arm is edited on its own; a joins them when alike");
            }
            Arms::Apart => match fields::arms_alike(&self.design) {
                Ok(()) => {
                    self.arms = Arms::Together;
                    self.refresh_rows();
                    let n = self.design.rotor.arms.len();
                    self.info(format!("arms together: one block edits all {n} arms"));
                }
                Err(why) => self.error(format!(
                    "arms not joined: {why}; * copies the selected arm to every arm"
                )),
            },
        }
    }
}

/// A value as a typing seed: the number in the shown unit, then the unit.
fn seed(dim: D, si: f64, system: units::UnitSystem) -> String {
    format!(
        "{}{}",
        units::format_number(units::to_display(dim, si, system)),
        units::unit_label(dim, system)
    )
}

/// How the list first shows a design's arms: together when they are alike.
pub(super) fn arms_shown(design: &Design) -> Arms {
    if fields::arms_alike(design).is_ok() {
        Arms::Together
    } else {
        Arms::Apart
    }
}
