//! Files: the picker's list, opening, saving (asking before overwriting a
//! file changed on disk or another existing file), and quitting with
//! unsaved changes.

use std::path::{Path, PathBuf};

use super::edit::arms_shown;
use super::{App, Confirm, InputTarget, Mode, Picker};
use crate::physics::design::Design;
use crate::scenario::{self, Scenario, ScenarioError};

/// Where a file picker looks: `scenarios/` and the current folder.
pub fn scenario_files(base: &Path) -> Vec<PathBuf> {
    let mut files = Vec::new();
    for dir in [base.join("scenarios"), base.to_path_buf()] {
        let Ok(entries) = std::fs::read_dir(&dir) else {
            continue;
        };
        let mut here: Vec<PathBuf> = entries
            .flatten()
            .map(|e| e.path())
            .filter(|p| p.is_file() && p.extension().is_some_and(|x| x == "ron"))
            .collect();
        here.sort();
        files.extend(here);
    }
    files
}

impl App {
    pub(super) fn ask_quit(&mut self) {
        if self.dirty {
            self.mode = Mode::Confirm(Confirm::QuitUnsaved);
        } else {
            self.quit = true;
        }
    }

    pub(super) fn start_save_as(&mut self) {
        self.start_input(InputTarget::SaveAs);
    }

    pub(super) fn suggested_name(&self) -> PathBuf {
        if let Some(p) = &self.path {
            return p.clone();
        }
        let slug: String = self
            .design
            .name
            .chars()
            .map(|c| {
                if c.is_ascii_alphanumeric() {
                    c.to_ascii_lowercase()
                } else {
                    '-'
                }
            })
            .collect();
        let slug = slug.trim_matches('-').to_string();
        let slug = if slug.is_empty() {
            "scenario".to_string()
        } else {
            slug
        };
        PathBuf::from(format!("{slug}.ron"))
    }

    /// Saves to `target` (or the file it came from). Unless `force`, a file
    /// changed on disk since it was read, or another existing file, is not
    /// overwritten without asking.
    pub fn save(&mut self, target: Option<PathBuf>, force: bool) {
        let Some(path) = target.or_else(|| self.path.clone()) else {
            self.start_save_as();
            return;
        };
        if !force {
            let same = self.path.as_ref().is_some_and(|p| *p == path);
            if same {
                let now = std::fs::read_to_string(&path).ok();
                if now.is_some() && now != self.disk_text {
                    self.mode = Mode::Confirm(Confirm::OverwriteChanged(path));
                    return;
                }
            } else if path.exists() {
                self.mode = Mode::Confirm(Confirm::OverwriteExisting(path));
                return;
            }
        }
        let new = Scenario::from_design(&self.design, self.units, &self.notes);
        match scenario::save_scenario(&path, self.source_text.as_deref(), &new) {
            Ok(saved) => {
                let how = match &saved.written {
                    scenario::Written::InPlace => "changed values only, comments kept".to_string(),
                    scenario::Written::Fresh => format!("{} units", self.units_word()),
                    scenario::Written::Rewritten(why) => {
                        format!("written anew in {} units: {why}", self.units_word())
                    }
                };
                self.info(format!("saved {} ({how})", path.display()));
                self.path = Some(path);
                let text = saved.text;
                self.source_text = Some(text.clone());
                self.disk_text = Some(text);
                self.dirty = false;
                self.as_saved = self.design.clone();
            }
            Err(e) => self.error(format!("not saved: {e}")),
        }
    }

    pub(super) fn open_picker(&mut self) {
        let base = &self.base_dir;
        let here = std::env::current_dir().unwrap_or_else(|_| PathBuf::from("."));
        let files: Vec<PathBuf> = scenario_files(base)
            .into_iter()
            .map(|p| p.strip_prefix(&here).map(Path::to_path_buf).unwrap_or(p))
            .collect();
        if files.is_empty() {
            self.error("no .ron scenarios in scenarios/ or the current folder");
            return;
        }
        self.mode = Mode::Picker(Picker { files, selected: 0 });
    }

    /// Replaces the design with a file's (the unit system and view stay).
    pub fn open_file(&mut self, path: &Path) {
        match App::read(path) {
            Ok((sc, design, text)) => {
                self.design = design;
                self.notes = sc.notes;
                self.path = Some(path.to_path_buf());
                self.source_text = Some(text.clone());
                self.disk_text = Some(text);
                self.dirty = false;
                self.as_saved = self.design.clone();
                self.history.clear();
                self.arms = arms_shown(&self.design);
                self.selected = 0;
                self.list_offset = 0;
                // The readings belong to the unit being checked.
                let readings = self.readings_on_open();
                self.resolve();
                self.selected = self.first_field_from(0, true);
                self.keep_selection_visible();
                self.info(format!("opened {}{readings}", path.display()));
            }
            Err(e) => self.error(format!("cannot open: {e}")),
        }
    }

    pub(super) fn read(path: &Path) -> Result<(Scenario, Design, String), ScenarioError> {
        let text = std::fs::read_to_string(path).map_err(|io| ScenarioError::Read {
            path: path.to_path_buf(),
            io,
        })?;
        let sc = scenario::load_str(&text, &path.display().to_string())?;
        let design = sc.to_design()?;
        Ok((sc, design, text))
    }
}
