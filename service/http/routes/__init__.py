"""One router per resource: health, checks, models (uploads), jobs, sections."""
