//! Inverse uses of the forward model. Some vary a design: sweeps of one or two
//! inputs ([`sweep`]), the input value that reaches a target speed or throw
//! ([`target`]), designs side by side ([`compare`]); what may be varied, its
//! name, unit and range come from the [`crate::catalogue`]. Others fit the
//! model to measurements: several speed readings at different pressures
//! ([`fit`]) and a coast-down after the water is shut off ([`coast`]), on a
//! small Levenberg–Marquardt least squares ([`lsq`]); readings files are parsed
//! in [`readings`]. The field check ([`field`], model.md M10) sets a
//! technician's readings at a running sprinkler against its design and names
//! the likely causes. A catch-can test is rated like the model's pattern and
//! set beside it ([`audit`]; read by [`crate::scenario::cans`]), and its leg
//! fits the spray's jet breakup ([`leg`], a scan and a golden-section search
//! over one parameter). A design search
//! ([`search`]) finds the values of a few free inputs that meet goals and
//! maximise an objective. Pure: no terminal, no files (the callers read them).

pub mod audit;
pub mod coast;
pub mod compare;
pub mod field;
pub mod fit;
pub mod leg;
pub mod lsq;
pub mod readings;
pub mod search;
pub mod sweep;
pub mod target;
