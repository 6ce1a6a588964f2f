"""The machine: leadscrew, change gears or gearbox, dials, compound scale, thread dial."""
