# Start shopterm when {user} logs in on tty1. Made by `shopterm --pi-boot profile`; add it to
# the login shell's start file:  shopterm --pi-boot profile >> ~/.bash_profile
# (or ~/.profile where there is no ~/.bash_profile). Only on the Pi's own console: an SSH
# login gets a shell. After Quit the shell stays, so the Pi can still be worked on there.
if [ "$(tty)" = /dev/tty1 ] && [ -z "$SSH_CONNECTION" ]; then
    setterm --blank 0 --powersave off 2>/dev/null      # the screen must not go blank
    {command}
fi
