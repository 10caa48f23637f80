//! Inverse uses of the model that fit it to measurements: several speed
//! readings at different pressures ([`fit`]) and a coast-down after the water
//! is shut off ([`coast`]), on a small Levenberg–Marquardt least squares
//! ([`lsq`]). Readings files are parsed in [`readings`]. Pure: no terminal,
//! no files (the callers read them).

pub mod coast;
pub mod fit;
pub mod lsq;
pub mod readings;
