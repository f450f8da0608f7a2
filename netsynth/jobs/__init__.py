"""The jobs behind the odd values: each module turns a practitioner's request into target
resistances (and reads a network's value back in the job's own units).

The jobs sit in the layer of :mod:`netsynth.design`: they may use the search, the analysis and
the result records, never :mod:`netsynth.api` or :mod:`netsynth.render`; where a job synthesizes
several networks in turn it takes the synthesis as a function argument.

Map of the package
------------------
``shared``   several targets from one bin, each taking its parts out before the next (greedy)
``meters``   meter shunts (single and ring) and multipliers (single and chain); full-scale errors
``sensors``  platinum RTDs (Callendar–Van Dusen, IEC 60751) and NTC thermistors (Beta,
             Steinhart–Hart); inverses; temperature error; calibration ladders
``trim``     the series or parallel trim that brings a measured part to its target; sensitivity
``divider``  two arms from one bin searched jointly: a ratio, an output voltage, a regulator's
             feedback divider; bands, ratio tempco (tracking), loads, output resistance
``rc``       the resistance for an RC time constant or corner frequency; τ and f bands
"""
