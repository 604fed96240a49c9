"""wallsched: cantilevered site retaining walls from grading profiles.

Data flows one way: ``wallsched.profile`` (files and geometry) ->
``wallsched.engine`` (soil and concrete) -> ``wallsched.exporters`` (files).
This hub holds the command line, the pipeline and the input-file loading.
"""

__version__ = "0.1.0"
