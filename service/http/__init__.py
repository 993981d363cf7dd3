"""The HTTP front end: app factory (:mod:`.app`), one router per resource (:mod:`.routes`),
guard, error body, settings and multipart upload."""
