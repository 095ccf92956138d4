//! Gradewright: the application. The command line lives in [`cli`], the
//! editor in [`gui`]; both load their input through [`load`] and hand the
//! design over through [`export`].

pub mod cli;
pub mod export;
pub mod gui;
pub mod load;
