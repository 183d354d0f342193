"""The curated public names stay importable (common practice, no source)."""
import resum


def test_public_names():
    for name in resum.__all__:
        assert hasattr(resum, name), name
    assert callable(resum.analyze) and callable(resum.evaluate)
