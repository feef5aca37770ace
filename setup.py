"""Packaging hook: ship the top-level grammar/ folder inside the wheel as sequencecheck/grammar/."""

import os

from setuptools import setup
from setuptools.command.build_py import build_py


class BuildPyWithGrammar(build_py):
    def run(self) -> None:
        super().run()
        target = os.path.join(self.build_lib, "sequencecheck", "grammar")
        self.mkpath(target)
        for name in sorted(os.listdir("grammar")):
            if name.endswith(".lark"):
                self.copy_file(os.path.join("grammar", name), os.path.join(target, name))


setup(cmdclass={"build_py": BuildPyWithGrammar})
