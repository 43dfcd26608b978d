//! The editor's windows, one module each. Like the panels they draw from the frame and send
//! actions; each keeps its own state (open or not, the text being typed, a draft) here.

pub mod argument;
pub mod by_parent;
pub mod command_list;
pub mod palette;
pub mod path;
pub mod recovery;
pub mod settings;
pub mod unsaved;

/// The windows' own state; `None` means closed.
#[derive(Default)]
pub struct Dialogs {
    pub path: path::PathWindow,
    pub commands: Option<command_list::CommandList>,
    pub palette: Option<palette::PaletteEditor>,
    pub settings: Option<settings::SettingsDraft>,
    pub by_parent: Option<by_parent::ByParentDraft>,
    pub walk: Option<argument::Walk>,
}
