"""The front ends and the one pipeline they call.

:mod:`.pipeline` checks a members file or a model; :mod:`.members_check` and
:mod:`.model_check` hold what differs between the two; :mod:`.cli`, :mod:`.http` and
:mod:`.jobs` are the command line, the HTTP service and its model jobs; :mod:`.reports`
holds the report and its writers.
"""
