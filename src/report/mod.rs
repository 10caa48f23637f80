//! The report layer: typed results of the physics and inverse modules put into
//! words, in the unit system the reader chose. The command line and the
//! terminal interface both word their results here, so a finding reads the
//! same in both. [`page`] builds the HTML page of the `report` command.

pub mod cans;
pub mod field;
pub mod fit;
pub mod page;
