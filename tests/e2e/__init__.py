"""End-to-end tests: the installed ``shopterm`` command driven in tmux at 80x24."""
