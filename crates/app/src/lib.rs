//! Gradewright: the application. The command line lives in [`cli`], the
//! editor in [`gui`], loading of input files in [`input`].

pub mod cli;
pub mod export;
pub mod gui;
pub mod input;
mod report;
