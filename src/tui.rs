//! The dockside terminal UI.
