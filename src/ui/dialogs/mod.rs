//! The editor's windows, one module each. Like the panels they draw from the frame and send
//! actions; each keeps its own state (open or not, the text being typed, a draft) here.

pub mod argument;
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
    pub walk: Option<argument::Walk>,
}

impl Dialogs {
    /// Closes the innermost open window (for Escape): the command list, the path window, the
    /// palette window, the project settings. False when none was open.
    pub fn close_innermost(&mut self) -> bool {
        self.commands.take().is_some()
            || self.path.prompt.take().is_some()
            || self.palette.take().is_some()
            || self.settings.take().is_some()
    }
}
