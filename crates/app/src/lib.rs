//! Gradewright: the application. The command line lives in [`cli`]; loading
//! of input files in [`input`].

pub mod cli;
pub mod input;
mod report;
