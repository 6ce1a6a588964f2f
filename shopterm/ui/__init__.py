"""The Textual app: the only part of shopterm that imports textual or rich."""
