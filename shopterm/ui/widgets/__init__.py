"""Widgets of our own: keypad entry, numbered pick list, key bar, status line."""
