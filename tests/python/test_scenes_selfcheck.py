"""The analytic scene library (tests/python/scenes) checks itself: meshes
(closure, orientation, volumes and centroids against closed forms), flows
(velocity gradients against central differences, loads against Gauss
quadrature and the published totals named in scenes.flows) and files (a VTK
XML round trip). Every other test relies on these scenes, so they run in CI.
"""
import scenes.selfcheck

scenes.selfcheck.run()
