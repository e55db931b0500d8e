"""The distribution installs one import name, ``rallyarc``; the stages live inside it."""

import importlib
import importlib.metadata as metadata
from pathlib import Path

STAGES = ("impact", "flight", "bounce", "viz", "configs")


def test_the_distribution_brings_one_top_level_name():
    names = {
        name
        for name, dists in metadata.packages_distributions().items()
        if "rallyarc" in dists and not name.startswith("__editable__")
    }
    assert names == {"rallyarc"}


def test_stages_are_subpackages_of_the_namespace():
    for stage in STAGES:
        module = importlib.import_module(f"rallyarc.{stage}")
        assert module.__name__ == f"rallyarc.{stage}"


def test_tests_import_the_installed_package_not_a_shadowing_source_folder():
    # the repository's own rallyarc/ folder holds no stage packages; if it shadowed the
    # install, rallyarc.impact would not import at all. Here it must resolve either into
    # site-packages (a regular install) or, for an editable install, into the repository's
    # top-level impact/ folder, mapped by the install.
    import rallyarc.impact

    where = Path(rallyarc.impact.__file__).resolve()
    assert where.parent.name == "impact"
    assert (
        "site-packages" in where.parts or where.parent.parent == Path(__file__).resolve().parents[2]
    )
