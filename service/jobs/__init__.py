"""Model jobs of the HTTP service.

The job table and folders (:mod:`.store`), the dispatcher that runs them in worker
processes (:mod:`.runner`) and the worker itself (:mod:`.worker`).
"""
