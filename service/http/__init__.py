"""The HTTP front end.

The app factory (:mod:`.app`), one router per resource (:mod:`.routes`), the guard, the
error body, the settings and the multipart upload.
"""
