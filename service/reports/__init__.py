"""The report and its writers.

The JSON report (:mod:`.report`), files written atomically -- JSON, CSV, JUnit, the checked
model -- (:mod:`.files`), the terminal summary (:mod:`.terminal`) and the comparison with a
previous report (:mod:`.baseline`).
"""
