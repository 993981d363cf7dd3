"""The engine: every engineering rule, numpy over whole member arrays (kip, inch, ksi).

See docs/design.md §1 and §8 for what lives in which module.
"""
