"""The physics layer: SI floats and NumPy arrays in and out; no units library, no I/O.

Properties of air and materials (:mod:`~finkit.physics.properties`), correlations
(:mod:`~finkit.physics.correlations`), single fins (:mod:`~finkit.physics.fins`,
:mod:`~finkit.physics.single_fin`), sink geometry, airflow (fans, system curves, bypass),
radiation, spreading and conduction, and the sink's thermal chain (:mod:`~finkit.physics.sink`).
Imports only NumPy/SciPy and the base modules (:mod:`finkit.errors`, :mod:`finkit.constants`,
:mod:`finkit.validity`, :mod:`finkit.interpolation`, :mod:`finkit.tolerance`).
"""
