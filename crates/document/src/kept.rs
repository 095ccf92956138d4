//! What a file the project was opened from holds beyond the design profile:
//! kept verbatim, so that writing the project back in that format changes
//! only what Gradewright edits (the plan geometry, station equations and
//! every other part of an agency's file survive a round trip).

use std::sync::Arc;

use serde::{Deserialize, Serialize};

/// The text of the file a project came from and which of its parts the
/// project's profile and ground are.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Kept {
    /// The file's text as read (shared: copies of a project do not copy it).
    pub text: Arc<str>,
    /// The alignment the profile belongs to.
    pub alignment: String,
    /// The design profile the project edits.
    pub profile: String,
    /// The ground line read with it, if any.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub surface: Option<String>,
}
