//! Every action a user can take, as one closed list. Menus, keyboard shortcuts, tooltips and the
//! searchable command list are all generated from it, so they can never disagree.

use egui::{Key, KeyboardShortcut, Modifiers};

/// The editing tools: what a click on the map does.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Tool {
    /// Click to select a region; drag to pan, or to move a marker.
    Select,
    /// Click empty map to place a new region drawn as a marker.
    Place,
    /// Click one region, then another, to add a border between them or take it away.
    Border,
    /// Click a region to fix it to the chosen palette colour (again to release it).
    Pin,
    /// Click regions to put them in the chosen same-colour group (again to take them out).
    Group,
    /// Click a region to switch it between land and water.
    Water,
}

impl Tool {
    pub const ALL: [Tool; 6] = [
        Tool::Select,
        Tool::Place,
        Tool::Border,
        Tool::Pin,
        Tool::Group,
        Tool::Water,
    ];

    pub fn label(self) -> &'static str {
        match self {
            Tool::Select => "Select",
            Tool::Place => "Place marker",
            Tool::Border => "Border",
            Tool::Pin => "Pin colour",
            Tool::Group => "Same-colour group",
            Tool::Water => "Land / water",
        }
    }

    /// What the status bar says while the tool is active.
    pub fn hint(self) -> &'static str {
        match self {
            Tool::Select => {
                "Click a region to select it. Drag to pan, wheel to zoom; drag a marker to move it."
            }
            Tool::Place => "Click on the map to place a new region drawn as a marker.",
            Tool::Border => {
                "Click a region, then a second one: adds a border, or takes an existing one away."
            }
            Tool::Pin => {
                "Click a region to pin it to the chosen colour; click again to release it."
            }
            Tool::Group => {
                "Click regions to add them to the chosen group (the first click starts a new group)."
            }
            Tool::Water => {
                "Click a region to switch it between land and water (water takes no colour)."
            }
        }
    }
}

/// What an export writes.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ExportFormat {
    /// A picture for print layouts, in millimetres.
    Svg,
    /// A raster picture at a chosen resolution.
    Png,
    /// A vector page for print on a chosen paper size, with the font embedded.
    Pdf,
    /// The regions with their colours, for a GIS.
    GeoJson,
    /// The same as a GeoPackage layer.
    GeoPackage,
    /// The same as a Shapefile (several files).
    Shapefile,
    /// A table of regions and colours.
    Csv,
}

impl ExportFormat {
    pub const ALL: [ExportFormat; 7] = [
        ExportFormat::Svg,
        ExportFormat::Png,
        ExportFormat::Pdf,
        ExportFormat::GeoJson,
        ExportFormat::GeoPackage,
        ExportFormat::Shapefile,
        ExportFormat::Csv,
    ];

    /// The file name offered by default.
    pub fn default_file_name(self) -> &'static str {
        match self {
            ExportFormat::Svg => "map.svg",
            ExportFormat::Png => "map.png",
            ExportFormat::Pdf => "map.pdf",
            ExportFormat::GeoJson => "map.geojson",
            ExportFormat::GeoPackage => "map.gpkg",
            ExportFormat::Shapefile => "map.shp",
            ExportFormat::Csv => "regions.csv",
        }
    }

    /// The file name extensions of the format (the first is the one added when missing).
    pub fn extensions(self) -> &'static [&'static str] {
        match self {
            ExportFormat::Svg => &["svg"],
            ExportFormat::Png => &["png"],
            ExportFormat::Pdf => &["pdf"],
            ExportFormat::GeoJson => &["geojson", "json"],
            ExportFormat::GeoPackage => &["gpkg"],
            ExportFormat::Shapefile => &["shp"],
            ExportFormat::Csv => &["csv"],
        }
    }

    /// The short name used in messages.
    pub fn name(self) -> &'static str {
        match self {
            ExportFormat::Svg => "SVG picture",
            ExportFormat::Png => "PNG picture",
            ExportFormat::Pdf => "PDF for print",
            ExportFormat::GeoJson => "GeoJSON",
            ExportFormat::GeoPackage => "GeoPackage",
            ExportFormat::Shapefile => "Shapefile",
            ExportFormat::Csv => "CSV table",
        }
    }
}

/// A command. Each knows its label, its tooltip and its keyboard shortcut.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Command {
    New,
    Open,
    Save,
    SaveAs,
    Quit,
    Undo,
    Redo,
    DeleteRegion,
    ClearSelection,
    FitView,
    ToggleBorders,
    ToggleLabels,
    UseTool(Tool),
    ColourFewest,
    /// Adds the palette slots the fewest-colours colouring lacks, then applies it.
    ColourAddingSlots,
    BalanceColours,
    /// Opens the colour-by-parent-unit window (families of tints by parent unit).
    ColourByParent,
    /// Finds the fewest rules to drop (corner contacts, borders added by hand, group
    /// memberships) so that the map takes one colour fewer than its minimum.
    FindRelaxations,
    /// Drops the rules found by `FindRelaxations` (one undoable step).
    ApplyRelaxations,
    /// Finds the fewest corner contacts or borders added by hand to drop so that the borders
    /// can be drawn flat.
    FindFlatRelaxations,
    /// Drops the contacts found by `FindFlatRelaxations` (one undoable step).
    ApplyFlatRelaxations,
    ExportProof,
    ClearColours,
    CommandList,
    /// Opens the palette window (edit slots, check distinctness, see simulated readers).
    /// The project's adjacency settings (rule, minimum shared length, tolerance).
    ProjectSettings,
    PaletteWindow,
    /// Moves colour classes to the palette slots that suit them best.
    AssignSlots,
    Export(ExportFormat),
}

/// Which menu a command appears in.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Menu {
    File,
    Edit,
    View,
    Tools,
    Colour,
    Export,
}

impl Menu {
    pub const ALL: [Menu; 6] = [
        Menu::File,
        Menu::Edit,
        Menu::View,
        Menu::Tools,
        Menu::Colour,
        Menu::Export,
    ];
    pub fn label(self) -> &'static str {
        match self {
            Menu::File => "File",
            Menu::Edit => "Edit",
            Menu::View => "View",
            Menu::Tools => "Tools",
            Menu::Colour => "Colour",
            Menu::Export => "Export",
        }
    }
}

impl Command {
    /// Every command, in menu order.
    pub fn all() -> Vec<Command> {
        let mut out = vec![
            Command::New,
            Command::Open,
            Command::Save,
            Command::SaveAs,
            Command::Quit,
            Command::Undo,
            Command::Redo,
            Command::DeleteRegion,
            Command::ClearSelection,
            Command::ProjectSettings,
            Command::FitView,
            Command::ToggleBorders,
            Command::ToggleLabels,
            Command::CommandList,
        ];
        out.extend(Tool::ALL.iter().map(|t| Command::UseTool(*t)));
        out.extend([
            Command::ColourFewest,
            Command::ColourAddingSlots,
            Command::BalanceColours,
            Command::ColourByParent,
            Command::FindRelaxations,
            Command::ApplyRelaxations,
            Command::FindFlatRelaxations,
            Command::ApplyFlatRelaxations,
            Command::PaletteWindow,
            Command::AssignSlots,
            Command::ExportProof,
            Command::ClearColours,
        ]);
        out.extend(ExportFormat::ALL.iter().map(|f| Command::Export(*f)));
        out
    }

    pub fn menu(self) -> Menu {
        match self {
            Command::New | Command::Open | Command::Save | Command::SaveAs | Command::Quit => {
                Menu::File
            }
            Command::Undo
            | Command::Redo
            | Command::DeleteRegion
            | Command::ClearSelection
            | Command::ProjectSettings => Menu::Edit,
            Command::FitView
            | Command::ToggleBorders
            | Command::ToggleLabels
            | Command::CommandList => Menu::View,
            Command::UseTool(_) => Menu::Tools,
            Command::ColourFewest
            | Command::ColourAddingSlots
            | Command::BalanceColours
            | Command::ColourByParent
            | Command::FindRelaxations
            | Command::ApplyRelaxations
            | Command::FindFlatRelaxations
            | Command::ApplyFlatRelaxations
            | Command::ExportProof
            | Command::ClearColours
            | Command::PaletteWindow
            | Command::AssignSlots => Menu::Colour,
            Command::Export(_) => Menu::Export,
        }
    }

    pub fn label(self) -> String {
        match self {
            Command::New => "New project".into(),
            Command::Open => "Open…".into(),
            Command::Save => "Save".into(),
            Command::SaveAs => "Save as…".into(),
            Command::Quit => "Quit".into(),
            Command::Undo => "Undo".into(),
            Command::Redo => "Redo".into(),
            Command::DeleteRegion => "Delete selected region".into(),
            Command::ClearSelection => "Clear selection".into(),
            Command::FitView => "Fit".into(),
            Command::ToggleBorders => "Show borders as links".into(),
            Command::ToggleLabels => "Show region names".into(),
            Command::CommandList => "Find a command…".into(),
            Command::UseTool(t) => format!("{} tool", t.label()),
            Command::ColourFewest => "Colour with the fewest colours".into(),
            Command::ColourAddingSlots => "Add the missing palette slots and colour".into(),
            Command::BalanceColours => "Even out colour use".into(),
            Command::ColourByParent => "Colour by parent unit…".into(),
            Command::FindRelaxations => "What to drop for one colour fewer".into(),
            Command::ApplyRelaxations => "Drop the rules found".into(),
            Command::FindFlatRelaxations => "What to drop to draw the borders flat".into(),
            Command::ApplyFlatRelaxations => "Drop the contacts found for a flat drawing".into(),
            Command::ExportProof => "Export the proof…".into(),
            Command::ClearColours => "Remove all colours".into(),
            Command::PaletteWindow => "Palette and print check…".into(),
            Command::ProjectSettings => "Project settings…".into(),
            Command::AssignSlots => "Most distinct colours for most borders".into(),
            Command::Export(ExportFormat::Svg) => "Picture for print (SVG)…".into(),
            Command::Export(ExportFormat::Png) => "Picture (PNG)…".into(),
            Command::Export(ExportFormat::Pdf) => "Page for print (PDF)…".into(),
            Command::Export(ExportFormat::GeoJson) => "Regions for GIS (GeoJSON)…".into(),
            Command::Export(ExportFormat::GeoPackage) => "Regions for GIS (GeoPackage)…".into(),
            Command::Export(ExportFormat::Shapefile) => "Regions for GIS (Shapefile)…".into(),
            Command::Export(ExportFormat::Csv) => "Table of regions (CSV)…".into(),
        }
    }

    pub fn tooltip(self) -> &'static str {
        match self {
            Command::New => "Start an empty project (asks before discarding unsaved work)",
            Command::Open => "Open a project or graph file",
            Command::Save => "Save the project (asks for a file name the first time)",
            Command::SaveAs => "Save the project under a new file name",
            Command::Quit => "Close Tinct (asks before discarding unsaved work)",
            Command::Undo => "Undo the last change",
            Command::Redo => "Redo the change just undone",
            Command::DeleteRegion => "Delete the selected region with its borders (undoable)",
            Command::ClearSelection => "Select nothing, and cancel a half-made border",
            Command::FitView => "Zoom and pan so the whole map fits the window",
            Command::ToggleBorders => {
                "Draw a line between neighbouring regions, styled by border kind"
            }
            Command::ToggleLabels => "Write region names on the map",
            Command::CommandList => "Search every command by name",
            Command::UseTool(t) => t.hint(),
            Command::ColourFewest => {
                "Colour the map with the fewest colours that honour pins and groups, keeping current colours where possible (undoable)"
            }
            Command::ColourAddingSlots => {
                "When the map needs more colours than the palette has: add the missing slots, each as distinct as possible from the others, and colour with the fewest colours (one undoable step)"
            }
            Command::BalanceColours => {
                "Recolour with the same number of colours, each used about equally often (undoable)"
            }
            Command::FindRelaxations => {
                "Find the fewest corner contacts, borders added by hand or group memberships to drop so that the map takes one colour fewer than it needs, with a proof that no smaller choice works"
            }
            Command::FindFlatRelaxations => {
                "Find the fewest corner contacts or borders added by hand to drop so that the borders can be drawn flat (and four colours are guaranteed), with proof that no smaller choice works"
            }
            Command::ApplyFlatRelaxations => {
                "Drop the contacts found for a flat drawing, in one undoable step: the borders stay on record as not counting"
            }
            Command::ApplyRelaxations => {
                "Drop the rules found for one colour fewer, in one undoable step: the borders stay on record as not counting, and regions leave their groups"
            }
            Command::ColourByParent => {
                "Colours that follow a hierarchy: a family of tints for each parent unit (a county's state), neighbouring parents in different families, neighbours within a parent in different tints (undoable)"
            }
            Command::ExportProof => {
                "Write the CNF and DRAT proof of each part of the map that rules out fewer colours, for checking with any DRAT checker"
            }
            Command::ClearColours => "Remove the colour of every region (undoable)",
            Command::ProjectSettings => {
                "Which contacts count as borders: shared edges only or corner contacts too, the shortest shared border that counts, and the tolerance borders are found with (undoable)"
            }
            Command::PaletteWindow => {
                "Edit the palette's colours and names, and check that neighbouring colours stay distinct in greyscale and for colour-blind readers"
            }
            Command::AssignSlots => {
                "Swap whole colours between palette slots so that the colours that meet most often get the most distinct slots; pinned colours stay (undoable)"
            }
            Command::Export(ExportFormat::Svg) => {
                "Write the coloured map with a legend as SVG, sized in millimetres for a print layout"
            }
            Command::Export(ExportFormat::Png) => {
                "Write the coloured map with a legend as a PNG image at the chosen resolution"
            }
            Command::Export(ExportFormat::Pdf) => {
                "Write the coloured map with a legend as a PDF page (A4, A3, Letter or your own size) for print, with the font embedded and names kept as text"
            }
            Command::Export(ExportFormat::GeoJson) => {
                "Write the regions with their colour number and fill as GeoJSON (longitude and latitude) for a GIS"
            }
            Command::Export(ExportFormat::GeoPackage) => {
                "Write the regions with their attributes, colour number and fill as a GeoPackage layer (longitude and latitude, or the source's own coordinate system) for a GIS"
            }
            Command::Export(ExportFormat::Shapefile) => {
                "Write the regions with their attributes as a Shapefile (.shp, .shx, .dbf, .prj); the colour number is tinct_col and the fill tinct_fill"
            }
            Command::Export(ExportFormat::Csv) => {
                "Write one row per region: id, name, colour number, fill, group and pin"
            }
        }
    }

    pub fn shortcut(self) -> Option<KeyboardShortcut> {
        let ctrl = |k| Some(KeyboardShortcut::new(Modifiers::COMMAND, k));
        let plain = |k| Some(KeyboardShortcut::new(Modifiers::NONE, k));
        match self {
            Command::New => ctrl(Key::N),
            Command::Open => ctrl(Key::O),
            Command::Save => ctrl(Key::S),
            Command::SaveAs => Some(KeyboardShortcut::new(
                Modifiers::COMMAND | Modifiers::SHIFT,
                Key::S,
            )),
            Command::Quit => ctrl(Key::Q),
            Command::Undo => ctrl(Key::Z),
            Command::Redo => ctrl(Key::Y),
            Command::DeleteRegion => plain(Key::Delete),
            Command::ClearSelection => plain(Key::Escape),
            Command::FitView => plain(Key::F),
            Command::ToggleBorders => plain(Key::L),
            Command::ToggleLabels => plain(Key::T),
            Command::CommandList => ctrl(Key::K),
            Command::UseTool(Tool::Select) => plain(Key::S),
            Command::UseTool(Tool::Place) => plain(Key::M),
            Command::UseTool(Tool::Border) => plain(Key::B),
            Command::UseTool(Tool::Pin) => plain(Key::P),
            Command::UseTool(Tool::Group) => plain(Key::G),
            Command::UseTool(Tool::Water) => plain(Key::W),
            Command::ColourFewest => ctrl(Key::Enter),
            Command::ColourAddingSlots => None,
            Command::BalanceColours => None,
            Command::ColourByParent => None,
            Command::FindRelaxations => None,
            Command::ApplyRelaxations => None,
            Command::FindFlatRelaxations => None,
            Command::ApplyFlatRelaxations => None,
            Command::ExportProof => None,
            Command::ClearColours => None,
            Command::PaletteWindow => None,
            Command::ProjectSettings => None,
            Command::AssignSlots => None,
            Command::Export(ExportFormat::Svg) => Some(KeyboardShortcut::new(
                Modifiers::COMMAND | Modifiers::SHIFT,
                Key::E,
            )),
            Command::Export(_) => None,
        }
    }

    /// Single-key shortcuts must not fire while the user types in a text field.
    pub fn needs_modifier_free_keyboard(self) -> bool {
        self.shortcut()
            .is_some_and(|s| s.modifiers == Modifiers::NONE)
    }
}

/// Commands whose label or description contains every word of `query` (case-insensitive),
/// best first: those whose label holds the words as whole words, then those whose label holds
/// them at all, then those that match only in the description; menu order within each.
pub fn search(query: &str) -> Vec<Command> {
    let words: Vec<String> = query.split_whitespace().map(str::to_lowercase).collect();
    let mut found: Vec<(u8, Command)> = Command::all()
        .into_iter()
        .filter_map(|c| {
            let label = c.label().to_lowercase();
            let text = format!("{label} {}", c.tooltip().to_lowercase());
            if !words.iter().all(|w| text.contains(w)) {
                return None;
            }
            let label_words: Vec<&str> = label
                .split(|ch: char| !ch.is_alphanumeric())
                .filter(|w| !w.is_empty())
                .collect();
            let rank = if words.iter().all(|w| label_words.contains(&w.as_str())) {
                0
            } else if words.iter().all(|w| label.contains(w)) {
                1
            } else {
                2
            };
            Some((rank, c))
        })
        .collect();
    found.sort_by_key(|(rank, _)| *rank);
    found.into_iter().map(|(_, c)| c).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shortcuts_are_unique() {
        let mut seen = Vec::new();
        for c in Command::all() {
            if let Some(s) = c.shortcut() {
                assert!(!seen.contains(&s), "{c:?} repeats a shortcut");
                seen.push(s);
            }
        }
    }

    #[test]
    fn search_matches_every_word() {
        assert_eq!(search("remove colour"), vec![Command::ClearColours]);
        assert!(search("tool").len() >= Tool::ALL.len());
        assert!(search("no such command at all").is_empty());
    }

    #[test]
    fn search_puts_whole_words_of_the_label_first() {
        assert_eq!(search("with the fewest")[0], Command::ColourFewest);
        assert_eq!(search("save as")[0], Command::SaveAs);
        assert_eq!(search("open")[0], Command::Open);
    }
}
