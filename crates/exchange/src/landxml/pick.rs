//! Which alignment, design profile and ground line a selection picks; an
//! open choice is an error that carries the names to choose from.

use gradewright_geometry::excerpt;
use roxmltree::Node;

use super::parse::{AlignmentNodes, Parsed, list};
use super::read::Selection;
use crate::ReadError;
use crate::error::Choosing;

impl<'a> Parsed<'a> {
    /// The one alignment and design profile `selection` picks.
    pub(super) fn pick_profile<'p>(
        &self,
        alignments: &'p [AlignmentNodes<'p, 'a>],
        selection: &Selection,
    ) -> Result<(&'p AlignmentNodes<'p, 'a>, usize), ReadError> {
        let root = self.doc.root_element();
        let chosen: Vec<&AlignmentNodes<'_, '_>> = match &selection.alignment {
            Some(name) => {
                let found: Vec<_> = alignments.iter().filter(|a| &a.name == name).collect();
                if found.is_empty() {
                    return Err(self.no_alignment(name, alignments));
                }
                found
            }
            None => alignments.iter().collect(),
        };
        let mut candidates = Vec::new();
        for a in &chosen {
            for (k, (name, holder, _)) in a.profiles.iter().enumerate() {
                let wanted =
                    selection.profile.as_ref().is_none_or(|p| p == name || holder.as_ref() == Some(p));
                if wanted {
                    candidates.push((*a, k));
                }
            }
        }
        let every = || {
            list(chosen.iter().flat_map(|a| a.profiles.iter().map(move |p| format!("{} / {}", a.name, p.0))))
        };
        match candidates.as_slice() {
            [one] => Ok(*one),
            [] if chosen.iter().all(|a| a.profiles.is_empty()) => Err(self.err(
                root,
                "ProfAlign",
                "no design profile (Alignments/Alignment/Profile/ProfAlign) in the file",
            )),
            [] => Err(self.err(
                root,
                "ProfAlign",
                format!(
                    "no design profile named '{}'; the file has (alignment / profile): {}",
                    excerpt(selection.profile.as_deref().unwrap_or("")),
                    every()
                ),
            )),
            _ => Err(self
                .err(
                    root,
                    "ProfAlign",
                    format!(
                        "the file holds {} design profiles (alignment / profile): {}",
                        candidates.len(),
                        every()
                    ),
                )
                .with_choice(
                    Choosing::Profile,
                    candidates
                        .iter()
                        .filter_map(|(a, k)| a.profiles.get(*k).map(|p| format!("{} / {}", a.name, p.0)))
                        .collect(),
                )),
        }
    }

    /// The ground line of `alignment` that `selection` picks, if any.
    pub(super) fn pick_surface<'p>(
        &self,
        alignment: &'p AlignmentNodes<'p, 'a>,
        selection: &Selection,
        required: bool,
    ) -> Result<Option<&'p (String, Node<'p, 'a>)>, ReadError> {
        let names = || list(alignment.surfaces.iter().map(|s| s.0.as_str()));
        if let Some(name) = &selection.surface {
            return match alignment.surfaces.iter().find(|s| &s.0 == name) {
                Some(s) => Ok(Some(s)),
                None => Err(self.err(
                    alignment.node,
                    "ProfSurf",
                    if alignment.surfaces.is_empty() {
                        format!(
                            "no ground line named '{}': alignment '{}' has none",
                            excerpt(name),
                            alignment.name
                        )
                    } else {
                        format!(
                            "no ground line named '{}' in alignment '{}'; it has: {}",
                            excerpt(name),
                            alignment.name,
                            names()
                        )
                    },
                )),
            };
        }
        match alignment.surfaces.as_slice() {
            [] if required => Err(self.err(
                alignment.node,
                "ProfSurf",
                format!("alignment '{}' has no ground line (Profile/ProfSurf)", alignment.name),
            )),
            [] => Ok(None),
            [one] => Ok(Some(one)),
            _ => Err(self
                .err(
                    alignment.node,
                    "ProfSurf",
                    format!(
                        "alignment '{}' holds {} ground lines: {}",
                        alignment.name,
                        alignment.surfaces.len(),
                        names()
                    ),
                )
                .with_choice(Choosing::Surface, alignment.surfaces.iter().map(|s| s.0.clone()).collect())),
        }
    }
}
